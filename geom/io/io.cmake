# tw_io: mesh writers and readers (STL, 3MF), CSV tables, report JSON helpers, atomic output
# folders. Writers take plain meshes (geom/kernel/mesh.hpp) and never see CGAL.
add_library(tw_io STATIC
  ${CMAKE_CURRENT_LIST_DIR}/csv.cpp
  ${CMAKE_CURRENT_LIST_DIR}/files.cpp
  ${CMAKE_CURRENT_LIST_DIR}/json.cpp
  ${CMAKE_CURRENT_LIST_DIR}/mesh_file.cpp
  ${CMAKE_CURRENT_LIST_DIR}/output_set.cpp
  ${CMAKE_CURRENT_LIST_DIR}/stl.cpp
  ${CMAKE_CURRENT_LIST_DIR}/text_util.cpp
  ${CMAKE_CURRENT_LIST_DIR}/three_mf_read.cpp
  ${CMAKE_CURRENT_LIST_DIR}/three_mf_write.cpp
  ${CMAKE_CURRENT_LIST_DIR}/zip_archive.cpp
)
target_include_directories(tw_io PUBLIC ${PROJECT_SOURCE_DIR})
# The version goes into every STL header and 3MF "Application" entry.
target_compile_definitions(tw_io PRIVATE TRIMWRIGHT_VERSION="${PROJECT_VERSION}")
# tw_kernel for kernel::Mesh (a plain struct); tw_io calls none of the kernel's functions.
target_link_libraries(tw_io
  PUBLIC tw_base tw_kernel nlohmann_json::nlohmann_json
  PRIVATE fmt::fmt libzip::zip ZLIB::ZLIB tw_warnings)
