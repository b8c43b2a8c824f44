# The library as a product: installs the build into a scratch prefix, checks that the installed
# headers are the public API alone, builds examples/api against the install with
# find_package(limitline CONFIG) and runs it.
# -DBUILD=build tree -DSRC=source tree -DWORK=scratch folder -DCONFIG=build type
# -DCXX=compiler -DFLAGS=extra compile and link flags (the sanitizers, when the build has them)
file(REMOVE_RECURSE ${WORK})
set(prefix ${WORK}/prefix)

function(run what)
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
  if(NOT rc EQUAL 0)
    message(FATAL_ERROR "${what} failed (${rc}):\n${out}\n${err}")
  endif()
  set(run_output "${out}" PARENT_SCOPE)
endfunction()

run("cmake --install" ${CMAKE_COMMAND} --install ${BUILD} --prefix ${prefix})

# No private piece and no third-party header reaches the installed API.
file(GLOB_RECURSE installed LIST_DIRECTORIES true ${prefix}/include/*)
set(detail_dirs ${installed})
list(FILTER detail_dirs INCLUDE REGEX "/detail(/|$)")
if(detail_dirs)
  message(FATAL_ERROR "installed private headers: ${detail_dirs}")
endif()
file(GLOB_RECURSE headers ${prefix}/include/limitline/*.hpp)
if(NOT headers)
  message(FATAL_ERROR "no headers installed under ${prefix}/include/limitline")
endif()
foreach(h ${headers})
  file(STRINGS ${h} includes REGEX "^#include <")
  foreach(line ${includes})
    if(line MATCHES "<(toml\\+\\+|fmt|boost|doctest|benchmark)/" OR line MATCHES "/detail/")
      message(FATAL_ERROR "${h} exposes a header outside the public API: ${line}")
    endif()
  endforeach()
endforeach()
foreach(f limitlineConfig.cmake limitlineConfigVersion.cmake limitlineTargets.cmake)
  file(GLOB_RECURSE found ${prefix}/*/${f})
  if(NOT found)
    message(FATAL_ERROR "the package file ${f} is not installed")
  endif()
endforeach()

run("configuring examples/api" ${CMAKE_COMMAND} -S ${SRC}/examples/api -B ${WORK}/api
    -DCMAKE_PREFIX_PATH=${prefix} -DCMAKE_BUILD_TYPE=${CONFIG} -DCMAKE_CXX_COMPILER=${CXX}
    "-DCMAKE_CXX_FLAGS=${FLAGS}" "-DCMAKE_EXE_LINKER_FLAGS=${FLAGS}")
run("building examples/api" ${CMAKE_COMMAND} --build ${WORK}/api)
run("running examples/api" ${WORK}/api/limitline_api_example)

# 75 °F / 50 % RH: about 28.1 Btu/lb at sea level (ASHRAE psychrometric chart no. 1) and about
# 30.7 Btu/lb at 6000 ft (ASHRAE 90.1 Table 6.5.1.1.3 footnote); both from memory.
# At exactly the 75 °F limit a fixed dry-bulb limit does not trip (limits read "off when
# above", common practice); 28.1 Btu/lb is above the 28 Btu/lb limit.
foreach(expected
    "75F/50% at 0 ft: enthalpy 28.1 Btu/lb"
    "75F/50% at 6000 ft: enthalpy 30.7 Btu/lb"
    "  dry-bulb 75F: economizer enabled"
    "  enthalpy 28 Btu/lb: economizer off")
  string(FIND "${run_output}" "${expected}" at)
  if(at EQUAL -1)
    message(FATAL_ERROR "examples/api printed no '${expected}':\n${run_output}")
  endif()
endforeach()
message(STATUS "examples/api against the installed package:\n${run_output}")
