# package.cmake - the libraries others build on, and what `cmake --install`
# puts where: the program, libbootrung (shared, with a versioned soname, and
# static), the public header, bootrung.pc for pkg-config, the CMake package
# (find_package(bootrung)), the man page and the bash completion.
#
# Both libraries are made of the layers' objects (compiled position
# independent with hidden visibility, CMakeLists.txt), so the shared one
# exports only what include/bootrung/*.h marks BR_API.
include(GNUInstallDirs)
include(CMakePackageConfigHelpers)

# While the major version is 0 every minor release may change the ABI, so
# the soname (and the CMake package's compatibility) follow MAJOR.MINOR.
if(PROJECT_VERSION_MAJOR EQUAL 0)
  set(BR_SOVERSION "0.${PROJECT_VERSION_MINOR}")
  set(BR_COMPAT SameMinorVersion)
else()
  set(BR_SOVERSION "${PROJECT_VERSION_MAJOR}")
  set(BR_COMPAT SameMajorVersion)
endif()

set(BR_LIB_OBJECTS $<TARGET_OBJECTS:br_core> $<TARGET_OBJECTS:br_io>
                   $<TARGET_OBJECTS:br_engine> $<TARGET_OBJECTS:br_report>
                   $<TARGET_OBJECTS:br_api>)
set(BR_LIB_DEPS GSL::gsl LibXml2::LibXml2 Threads::Threads m)

add_library(bootrung_shared SHARED ${BR_LIB_OBJECTS})
set_target_properties(bootrung_shared PROPERTIES
  OUTPUT_NAME bootrung VERSION ${PROJECT_VERSION} SOVERSION ${BR_SOVERSION}
  EXPORT_NAME bootrung)
target_link_libraries(bootrung_shared PRIVATE ${BR_LIB_DEPS})
# A symbol left undefined would only show when a program loads the library.
target_link_options(bootrung_shared PRIVATE -Wl,--no-undefined)

add_library(bootrung_static STATIC ${BR_LIB_OBJECTS})
set_target_properties(bootrung_static PROPERTIES OUTPUT_NAME bootrung EXPORT_NAME bootrung_static)
target_link_libraries(bootrung_static PUBLIC ${BR_LIB_DEPS})

foreach(t bootrung_shared bootrung_static)
  target_include_directories(${t} INTERFACE
    $<BUILD_INTERFACE:${CMAKE_SOURCE_DIR}/include>
    $<INSTALL_INTERFACE:${CMAKE_INSTALL_INCLUDEDIR}>)
endforeach()
add_library(bootrung::bootrung ALIAS bootrung_shared)
add_library(bootrung::bootrung_static ALIAS bootrung_static)

install(TARGETS bootrung RUNTIME DESTINATION ${CMAKE_INSTALL_BINDIR})
install(TARGETS bootrung_shared bootrung_static EXPORT bootrungTargets
  LIBRARY DESTINATION ${CMAKE_INSTALL_LIBDIR}
  ARCHIVE DESTINATION ${CMAKE_INSTALL_LIBDIR}
  RUNTIME DESTINATION ${CMAKE_INSTALL_BINDIR})
install(DIRECTORY ${CMAKE_SOURCE_DIR}/include/bootrung
  DESTINATION ${CMAKE_INSTALL_INCLUDEDIR} FILES_MATCHING PATTERN "*.h")

# bootrung.pc finds its prefix from where it lies (${pcfiledir}), so a copy
# installed under any prefix or DESTDIR, or moved, stays right.
set(BR_PC_UP "")
if(NOT IS_ABSOLUTE "${CMAKE_INSTALL_LIBDIR}")
  string(REPLACE "/" ";" br_parts "${CMAKE_INSTALL_LIBDIR}/pkgconfig")
  foreach(p ${br_parts})
    string(APPEND BR_PC_UP "/..")
  endforeach()
endif()
foreach(kind LIBDIR INCLUDEDIR)
  if(IS_ABSOLUTE "${CMAKE_INSTALL_${kind}}")
    set(BR_PC_${kind} "${CMAKE_INSTALL_${kind}}")
  else()
    set(BR_PC_${kind} "\${prefix}/${CMAKE_INSTALL_${kind}}")
  endif()
endforeach()
configure_file(${CMAKE_SOURCE_DIR}/cmake/bootrung.pc.in ${CMAKE_BINARY_DIR}/bootrung.pc @ONLY)
install(FILES ${CMAKE_BINARY_DIR}/bootrung.pc DESTINATION ${CMAKE_INSTALL_LIBDIR}/pkgconfig)

set(BR_CMAKE_DIR ${CMAKE_INSTALL_LIBDIR}/cmake/bootrung)
install(EXPORT bootrungTargets NAMESPACE bootrung:: DESTINATION ${BR_CMAKE_DIR})
configure_package_config_file(${CMAKE_SOURCE_DIR}/cmake/bootrungConfig.cmake.in
  ${CMAKE_BINARY_DIR}/bootrungConfig.cmake INSTALL_DESTINATION ${BR_CMAKE_DIR})
write_basic_package_version_file(${CMAKE_BINARY_DIR}/bootrungConfigVersion.cmake
  VERSION ${PROJECT_VERSION} COMPATIBILITY ${BR_COMPAT})
install(FILES ${CMAKE_BINARY_DIR}/bootrungConfig.cmake
              ${CMAKE_BINARY_DIR}/bootrungConfigVersion.cmake
        DESTINATION ${BR_CMAKE_DIR})

# The manual page (its version filled in) and the bash completion.
set(VERSION ${PROJECT_VERSION})
configure_file(${CMAKE_SOURCE_DIR}/man/bootrung.1 ${CMAKE_BINARY_DIR}/man/bootrung.1 @ONLY)
install(FILES ${CMAKE_BINARY_DIR}/man/bootrung.1 DESTINATION ${CMAKE_INSTALL_MANDIR}/man1)
install(FILES ${CMAKE_SOURCE_DIR}/completion/bootrung.bash
        DESTINATION ${CMAKE_INSTALL_DATADIR}/bash-completion/completions RENAME bootrung)
