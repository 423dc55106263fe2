# The paper setting chart (page 1: setting card; page 2: 1:1 angle template), drawn with Cairo.
# Included from geom/io/CMakeLists.txt. Plain-data input (geom/io/chart.hpp): no kernel headers.
add_library(tw_chart STATIC
  ${CMAKE_CURRENT_LIST_DIR}/chart.cpp           # validation, formatting, PDF/SVG/PNG surfaces
  ${CMAKE_CURRENT_LIST_DIR}/chart_draw.cpp      # text measuring, wrapping, shapes in mm
  ${CMAKE_CURRENT_LIST_DIR}/chart_card.cpp      # page 1: the setting card
  ${CMAKE_CURRENT_LIST_DIR}/chart_template.cpp  # page 2: the angle template and scale bar
)
target_link_libraries(tw_chart
  PUBLIC tw_base fmt::fmt PkgConfig::CAIRO
  PRIVATE tw_warnings)
target_compile_definitions(tw_chart PRIVATE TRIMWRIGHT_FONT_FAMILY="${TRIMWRIGHT_FONT_FAMILY}")
