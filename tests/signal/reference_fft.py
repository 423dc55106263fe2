#!/usr/bin/env python3
# SPDX-License-Identifier: GPL-3.0-or-later
"""Independent check of trimwright's recording readings with NumPy.

Reads the manifest written by `tw_signal_tests "[reference-files]"`, opens each synthetic
recording with its own CSV/WAV code, and measures it its own way:
  * speed: mean interval between threshold crossings of the reference (midpoint of its range),
    or without a reference the Hann-windowed FFT peak refined by a grid search of the
    least-squares 1x amplitude;
  * 1x amplitude and phase: one least-squares fit over the whole recording (numpy.linalg.lstsq)
    of offset, slope, orders 1-3 in the shaft angle interpolated between raw pulse times, and the
    mains line when the file has one; and, for evenly sampled files without mains, a plain FFT
    over a whole number of revolutions.
Each figure is compared with the known truth and with trimwright's figure (1 % amplitude,
1 degree phase, 1e-4 speed). Prints one line per check and 'N passed, M failed'.
"""
import csv
import math
import os
import struct
import sys

try:
    import numpy as np
except ImportError:
    print("reference_fft.py: NumPy is missing; install the Debian package python3-numpy")
    print("0 passed, 1 failed")
    sys.exit(1)

G = 9.80665  # standard gravity, m/s^2 (CGPM)


def read_csv(path):
    with open(path) as f:
        header = f.readline().strip().split(",")
    data = np.loadtxt(path, delimiter=",", skiprows=1)
    t = data[:, header.index("time_s")]
    z = data[:, header.index("z_g")]
    ref = data[:, header.index("ref")] if "ref" in header else None
    return t - t[0], z, ref


def read_wav(path, full_scale_g):
    raw = open(path, "rb").read()
    assert raw[:4] == b"RIFF" and raw[8:12] == b"WAVE"
    pos, fmt, data = 12, None, None
    while pos + 8 <= len(raw):
        cid, size = raw[pos:pos + 4], struct.unpack("<I", raw[pos + 4:pos + 8])[0]
        body = raw[pos + 8:pos + 8 + size]
        if cid == b"fmt ":
            fmt = struct.unpack("<HHIIHH", body[:16])
        elif cid == b"data":
            data = body
        pos += 8 + size + (size & 1)
    tag, channels, rate, _, _, bits = fmt
    if tag == 3 and bits == 32:
        x = np.frombuffer(data, dtype="<f4").astype(float)
    elif tag == 1 and bits == 16:
        x = np.frombuffer(data, dtype="<i2").astype(float) / 32768.0
    else:
        raise ValueError("unsupported WAV in the reference set")
    x = x.reshape(-1, channels)
    t = np.arange(x.shape[0]) / rate
    z = x[:, 0] * full_scale_g
    ref = x[:, 1] if channels == 2 else None
    return t, z, ref


def pulse_times(t, ref):
    thr = 0.5 * (ref.min() + ref.max())
    above = ref >= thr
    idx = np.nonzero(~above[:-1] & above[1:])[0]
    t0, t1, r0, r1 = t[idx], t[idx + 1], ref[idx], ref[idx + 1]
    return t0 + (t1 - t0) * (thr - r0) / (r1 - r0)


def lsq(t, z, theta, mains_hz):
    cols = [np.ones_like(t), t - t.mean()]
    for k in (1, 2, 3):
        cols += [np.cos(k * theta), np.sin(k * theta)]
    if mains_hz > 0:
        cols += [np.cos(2 * np.pi * mains_hz * t), np.sin(2 * np.pi * mains_hz * t)]
    a = np.column_stack(cols)
    beta = np.linalg.lstsq(a, z, rcond=None)[0]
    c = complex(beta[2], beta[3])
    return abs(c), math.degrees(math.atan2(c.imag, c.real)) % 360.0


def angle_diff(a, b):
    return abs((a - b + 180.0) % 360.0 - 180.0)


def main(manifest):
    base = os.path.dirname(manifest)
    passed = failed = 0

    def check(ok, what):
        nonlocal passed, failed
        print(("ok    " if ok else "FAIL  ") + what)
        if ok:
            passed += 1
        else:
            failed += 1

    with open(manifest) as f:
        rows = list(csv.DictReader(f))
    if not rows:
        check(False, "manifest lists no recordings")
    for r in rows:
        name = r["file"]
        path = os.path.join(base, name)
        if r["format"] == "csv":
            t, z, ref = read_csv(path)
        else:
            t, z, ref = read_wav(path, float(r["full_scale_g"]))
        has_ref = r["has_ref"] == "1"
        mains = float(r["mains_hz"])
        true_rpm, true_amp, true_lag = float(r["true_rpm"]), float(r["true_amp_g"]), float(r["true_lag_deg"])
        our_rpm, our_amp = float(r["our_rpm"]), float(r["our_amp_g"])
        if has_ref:
            p = pulse_times(t, ref)
            f1 = (len(p) - 1) / (p[-1] - p[0])
            keep = (t >= p[0]) & (t < p[-1])
            tt, zz = t[keep], z[keep]
            theta = 2 * np.pi * np.interp(tt, p, np.arange(len(p)))
            amp, lag = lsq(tt, zz, theta, mains)
        else:
            fs = (len(t) - 1) / (t[-1] - t[0])
            n = 1 << int(math.ceil(math.log2(len(t) * 8)))
            spec = np.abs(np.fft.rfft((z - z.mean()) * np.hanning(len(z)), n))
            freqs = np.fft.rfftfreq(n, 1 / fs)
            lo, hi = 0.8 * true_rpm / 60, 1.2 * true_rpm / 60
            band = np.nonzero((freqs > lo) & (freqs < hi))[0]
            k = band[np.argmax(spec[band])]
            grid = np.linspace(freqs[k - 1], freqs[k + 1], 201)
            amps = [lsq(t, z, 2 * np.pi * f * t, mains)[0] for f in grid]
            f1 = grid[int(np.argmax(amps))]
            amp, lag = max(amps), None
        rpm = 60 * f1
        check(abs(rpm - true_rpm) <= 1e-4 * true_rpm, f"{name}: numpy speed {rpm:.3f} rpm vs true {true_rpm}")
        check(abs(rpm - our_rpm) <= 1e-4 * true_rpm, f"{name}: numpy speed {rpm:.3f} rpm vs trimwright {our_rpm:.3f}")
        check(abs(amp - true_amp) <= 0.01 * true_amp, f"{name}: numpy 1x {amp:.5f} g vs true {true_amp}")
        check(abs(amp - our_amp) <= 0.01 * true_amp, f"{name}: numpy 1x {amp:.5f} g vs trimwright {our_amp:.5f}")
        if has_ref:
            our_lag = float(r["our_phase_deg"])
            check(angle_diff(lag, true_lag) <= 1.0, f"{name}: numpy lag {lag:.2f} deg vs true {true_lag}")
            check(angle_diff(lag, our_lag) <= 1.0, f"{name}: numpy lag {lag:.2f} deg vs trimwright {our_lag:.2f}")
        else:
            check(r["our_phase_deg"] == "", f"{name}: trimwright gives no phase without a reference")
        # A plain FFT over whole revolutions, where nothing else shares the spectrum.
        even = np.allclose(np.diff(t), t[1] - t[0], rtol=1e-6)
        if even and mains == 0:
            fs = 1 / (t[1] - t[0])
            start = 0 if not has_ref else int(np.searchsorted(t, p[0]))
            revs = int((t[-1] - t[start]) * f1)
            count = int(round(revs * fs / f1))
            seg = z[start:start + count]
            x = np.fft.fft(seg - seg.mean())[revs]
            famp = 2 * abs(x) / count
            check(abs(famp - true_amp) <= 0.02 * true_amp, f"{name}: numpy FFT 1x {famp:.5f} g vs true {true_amp}")
            if has_ref:
                # x = A/2·N·e^(−iφ) for A·cos(θ − φ), with the first sample at the pulse (within one sample).
                flag = (-math.degrees(np.angle(x))) % 360.0
                tol = 360 * f1 / fs + 1.0
                check(angle_diff(flag, true_lag) <= tol, f"{name}: numpy FFT lag {flag:.2f} deg vs true {true_lag}")
    print(f"{passed} passed, {failed} failed")
    return 0 if failed == 0 else 1


if __name__ == "__main__":
    if len(sys.argv) != 2:
        print("usage: reference_fft.py MANIFEST.csv")
        sys.exit(2)
    sys.exit(main(sys.argv[1]))
