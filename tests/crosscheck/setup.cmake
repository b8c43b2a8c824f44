# CTest fixture for the psychrolib cross-check: installs the pinned psychrolib with `npm ci`
# into a copy of this folder under the build tree (the source tree stays clean, and build
# folders never share a node_modules), then writes the reference CSV.
#
#   cmake -DSRC=<tests/crosscheck> -DWORK=<build>/crosscheck -DOUT=<csv> -P setup.cmake
#
# Every failure is fatal: the cross-check must never pass by not running.
foreach(var SRC WORK OUT)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "crosscheck setup: -D${var}=... is required")
  endif()
endforeach()

find_program(NODE_EXE NAMES node nodejs)
find_program(NPM_EXE NAMES npm)
if(NOT NODE_EXE OR NOT NPM_EXE)
  message(FATAL_ERROR "crosscheck setup: Node.js and npm are needed for the psychrolib "
                      "cross-check. Install the Debian packages: apt-get install nodejs npm "
                      "(or run: bash .ci/setup)")
endif()

file(MAKE_DIRECTORY "${WORK}")
file(COPY "${SRC}/package.json" "${SRC}/package-lock.json" "${SRC}/generate.js"
     DESTINATION "${WORK}")
file(REMOVE "${OUT}")

# --prefer-offline: a warm npm cache is enough, so repeated runs need no network.
execute_process(
  COMMAND "${NPM_EXE}" ci --no-audit --no-fund --prefer-offline
  WORKING_DIRECTORY "${WORK}"
  RESULT_VARIABLE npm_rc)
if(NOT npm_rc EQUAL 0)
  message(FATAL_ERROR "crosscheck setup: 'npm ci' failed (${npm_rc}) in ${WORK}; psychrolib "
                      "1.1.1 must come from the npm registry or the npm cache")
endif()

execute_process(
  COMMAND "${NODE_EXE}" "${WORK}/generate.js" "${OUT}"
  WORKING_DIRECTORY "${WORK}"
  RESULT_VARIABLE node_rc)
if(NOT node_rc EQUAL 0 OR NOT EXISTS "${OUT}")
  message(FATAL_ERROR "crosscheck setup: generate.js failed (${node_rc})")
endif()
