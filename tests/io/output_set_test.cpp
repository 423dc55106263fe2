// SPDX-License-Identifier: GPL-3.0-or-later
// Atomic output folders and safe file names.
#include "geom/io/output_set.hpp"

#include <sys/stat.h>

#include <catch2/catch.hpp>
#include <filesystem>
#include <string>

#include "geom/base/error.hpp"
#include "geom/io/files.hpp"
#include "tests/support/temp_dir.hpp"

using trimwright::ExitCode;
using trimwright::FileError;
using trimwright::InputError;
using trimwright::InternalError;
using trimwright::io::is_plain_file_name;
using trimwright::io::OutputSet;
using trimwright::io::sanitize_file_stem;
using trimwright::io::write_file_atomic;
namespace test = trimwright::test;
namespace fs = std::filesystem;

TEST_CASE("output set: writes every file and creates the folder", "[io][output]") {
  test::TempDir dir;
  const std::string out = dir.file("nested/out");
  OutputSet set(out);
  set.add("part.stl", "stl bytes");
  set.add("report.json", "{}\n");
  set.add_writer("chart.png", [](const std::string& path) { test::write_bytes(path, "png"); });
  const auto paths = set.commit();
  REQUIRE(paths.size() == 3);
  CHECK(paths[0] == out + "/part.stl");
  const auto snap = test::folder_snapshot(out);
  CHECK(snap == std::map<std::string, std::string>{
                    {"part.stl", "stl bytes"}, {"report.json", "{}\n"}, {"chart.png", "png"}});
  CHECK_THROWS_AS(set.commit(), InternalError);
}

TEST_CASE("output set: flushing to disk gives the same result", "[io][output]") {
  test::TempDir dir;
  OutputSet set(dir.path(), true);
  set.add("part.stl", "stl bytes");
  set.add_writer("chart.svg", [](const std::string& path) { test::write_bytes(path, "<svg/>"); });
  set.commit();
  write_file_atomic(dir.file("single.txt"), "one", true);
  CHECK(test::folder_snapshot(dir.path()) ==
        std::map<std::string, std::string>{
            {"part.stl", "stl bytes"}, {"chart.svg", "<svg/>"}, {"single.txt", "one"}});
}

TEST_CASE("output set: a writer that writes nothing is a bug, reported and rolled back",
          "[io][output]") {
  test::TempDir dir;
  OutputSet set(dir.path());
  set.add("a.stl", "a");
  set.add_writer("chart.png", [](const std::string&) {});
  CHECK_THROWS_AS(set.commit(), FileError);  // the writer's temporary does not exist
  CHECK(test::folder_snapshot(dir.path()).empty());
}

TEST_CASE("output set: replaces its own files, leaves other files alone", "[io][output]") {
  test::TempDir dir;
  test::write_bytes(dir.file("part.stl"), "old part");
  test::write_bytes(dir.file("notes.txt"), "the user's notes");
  OutputSet set(dir.path());
  set.add("part.stl", "new part");
  set.commit();
  CHECK(test::folder_snapshot(dir.path()) ==
        std::map<std::string, std::string>{{"part.stl", "new part"},
                                           {"notes.txt", "the user's notes"}});
}

TEST_CASE("output set: a target that is a folder stops the run before anything is written",
          "[io][output]") {
  test::TempDir dir;
  test::write_bytes(dir.file("part.stl"), "old part");
  fs::create_directory(dir.file("report.json"));
  test::write_bytes(dir.file("report.json/inside"), "x");
  const auto before = test::folder_snapshot(dir.path());
  OutputSet set(dir.path());
  set.add("part.stl", "new part");
  set.add("report.json", "{}");
  try {
    set.commit();
    FAIL("no FileError");
  } catch (const FileError& e) {
    CHECK(e.code() == ExitCode::kFileError);
    CHECK(std::string(e.what()) == dir.file("report.json") +
                                       ": cannot write: it exists and is not a regular file (a "
                                       "folder or a link); left as it is");
  }
  CHECK(test::folder_snapshot(dir.path()) == before);
}

TEST_CASE("output set: a failure part-way through writing leaves the folder as it was",
          "[io][output]") {
  test::TempDir dir;
  test::write_bytes(dir.file("a.stl"), "old a");
  test::write_bytes(dir.file("keep.txt"), "keep");
  const auto before = test::folder_snapshot(dir.path());
  OutputSet set(dir.path());
  set.add("a.stl", "new a");
  set.add("b.stl", "new b");
  set.add_writer("chart.pdf", [](const std::string& path) {
    test::write_bytes(path, "half a pdf");  // a writer that fails after creating its file
    throw FileError(path + ": cannot write: disk full (simulated)");
  });
  set.add("report.json", "{}");
  CHECK_THROWS_WITH(set.commit(), Catch::Contains("disk full (simulated)"));
  CHECK(test::folder_snapshot(dir.path()) == before);  // no temporaries, old a.stl intact
}

TEST_CASE("output set: a failure while renaming puts the old files back", "[io][output]") {
  test::TempDir dir;
  test::write_bytes(dir.file("a.stl"), "old a");
  test::write_bytes(dir.file("b.stl"), "old b");
  const auto before = test::folder_snapshot(dir.path());
  OutputSet set(dir.path());
  set.add("a.stl", "new a");
  set.add("b.stl", "new b");
  // After the checks, while the temporaries are written, something puts a folder where the
  // last file goes: the final rename fails after a.stl and b.stl were already replaced.
  const std::string blocker = dir.file("c.json");
  set.add_writer("c.json", [blocker](const std::string& path) {
    test::write_bytes(path, "{}");
    fs::create_directory(blocker);
    test::write_bytes(blocker + "/x", "x");
  });
  CHECK_THROWS_AS(set.commit(), FileError);
  auto after = test::folder_snapshot(dir.path());
  after.erase("c.json");
  after.erase("c.json/x");
  CHECK(after == before);
}

TEST_CASE("output set: a new folder is removed again when the run fails", "[io][output]") {
  test::TempDir dir;
  OutputSet set(dir.file("new/deeper"));
  set.add_writer("x.stl", [](const std::string& path) {
    throw FileError(path + ": cannot write: simulated");
  });
  CHECK_THROWS_AS(set.commit(), FileError);
  CHECK(test::folder_snapshot(dir.path()).empty());
}

TEST_CASE("output set: an unwritable folder is a FileError naming the path and the reason",
          "[io][output]") {
  if (::geteuid() == 0) {
    // Root ignores permission bits; use a path under a regular file instead.
    test::TempDir dir;
    test::write_bytes(dir.file("file"), "x");
    OutputSet set(dir.file("file/out"));
    set.add("a.stl", "a");
    CHECK_THROWS_WITH(set.commit(),
                      Catch::Contains(dir.file("file/out")) && Catch::Contains("Not a directory"));
    return;
  }
  test::TempDir dir;
  fs::create_directory(dir.file("locked"));
  ::chmod(dir.file("locked").c_str(), 0555);
  OutputSet set(dir.file("locked"));
  set.add("a.stl", "a");
  CHECK_THROWS_WITH(set.commit(), Catch::Contains("a.stl") && Catch::Contains("Permission denied"));
  ::chmod(dir.file("locked").c_str(), 0755);
}

TEST_CASE("output set: file names must be plain, and unique", "[io][output]") {
  OutputSet set("unused");
  CHECK_THROWS_AS(set.add("../x.stl", ""), InternalError);
  CHECK_THROWS_AS(set.add(".hidden", ""), InternalError);
  CHECK_THROWS_AS(set.add("", ""), InternalError);
  CHECK_THROWS_AS(set.add("a\\b", ""), InternalError);
  set.add("a.stl", "");
  CHECK_THROWS_AS(set.add("a.stl", ""), InternalError);
  CHECK(set.file_names() == std::vector<std::string>{"a.stl"});
  CHECK(is_plain_file_name("Left-wheel-36-grit.3mf"));
  CHECK_FALSE(is_plain_file_name("a\x01.stl"));
}

TEST_CASE("write_file_atomic: replaces whole files, never leaves a temporary", "[io][output]") {
  test::TempDir dir;
  write_file_atomic(dir.file("x.bin"), "first");
  write_file_atomic(dir.file("x.bin"), "second");
  CHECK(test::folder_snapshot(dir.path()) ==
        std::map<std::string, std::string>{{"x.bin", "second"}});
  fs::create_directory(dir.file("d"));
  CHECK_THROWS_WITH(write_file_atomic(dir.file("d"), "x"),
                    Catch::StartsWith(dir.file("d") + ": cannot write: "));
  CHECK(test::folder_snapshot(dir.path()) ==
        std::map<std::string, std::string>{{"x.bin", "second"}, {"d", "<dir>"}});
}

TEST_CASE("sanitize: hostile titles become safe file stems", "[io][output]") {
  CHECK(sanitize_file_stem("Left wheel, 36 grit") == "Left-wheel-36-grit");
  CHECK(sanitize_file_stem("../../etc/passwd") == "etc-passwd");
  CHECK(sanitize_file_stem(".hidden") == "hidden");
  CHECK(sanitize_file_stem("a/b\\c") == "a-b-c");
  CHECK(sanitize_file_stem("tab\there\nnew\x7f"
                           "del\x1b[31mred") == "tab-here-new-del-31mred");
  CHECK(sanitize_file_stem("") == "trimwright");
  CHECK(sanitize_file_stem("..", "job") == "job");
  CHECK(sanitize_file_stem("/// \\\\ ...", "") == "trimwright");
  CHECK(sanitize_file_stem("-rf") == "rf");  // never read as a command-line option
  CHECK(sanitize_file_stem("Schleifscheibe K\xC3\xB6rnung 60") ==
        "Schleifscheibe-K\xC3\xB6rnung-60");
  // Direction override (U+202E), zero-width space (U+200B), BOM, invalid UTF-8.
  CHECK(sanitize_file_stem("evil\xE2\x80\xAEgnp.exe") == "evil-gnp.exe");
  CHECK(sanitize_file_stem("a\xE2\x80\x8B"
                           "b\xEF\xBB\xBF"
                           "c\xFF"
                           "d") == "a-b-c-d");
  CHECK(sanitize_file_stem("fullwidth\xEF\xBC\x8Fslash") == "fullwidth-slash");
  CHECK(sanitize_file_stem("CON") == "CON_");
  CHECK(sanitize_file_stem("lpt1.stl") == "lpt1_.stl");
  CHECK(sanitize_file_stem("console") == "console");
}

TEST_CASE("sanitize: length limit cuts at a character boundary", "[io][output]") {
  const std::string long_title(500, 'w');
  CHECK(sanitize_file_stem(long_title).size() == trimwright::io::kMaxFileStemBytes);
  // "ö" is two bytes: a cut inside it drops the whole character.
  CHECK(sanitize_file_stem("ab\xC3\xB6", "x", 3) == "ab");
  CHECK(sanitize_file_stem("ab-cd", "x", 3) == "ab");  // no trailing '-'
  for (std::size_t n = 1; n <= 12; ++n) {
    const std::string s = sanitize_file_stem(
        "..//r\xC3\xA4"
        "der & Scheiben",
        "fallback", n);
    CHECK(!s.empty());
    CHECK(s.size() <= n);
    CHECK(s.front() != '.');
    CHECK(is_plain_file_name(s));
  }
}
