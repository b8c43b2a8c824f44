# CTest fixture of the study page's browser test: installs the pinned puppeteer-core with
# `npm ci` into WORK (the build tree; the source tree stays clean). puppeteer-core downloads no
# browser: the test drives Debian's Chromium.
#
#   cmake -DSRC=<tests/browser/serve> -DWORK=<build>/browser-serve -P setup.cmake
#
# Every failure is fatal: the browser test must never pass by not running.
foreach(var SRC WORK)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "serve browser setup: -D${var}=... is required")
  endif()
endforeach()
find_program(NPM_EXE NAMES npm)
if(NOT NPM_EXE)
  message(FATAL_ERROR "serve browser setup: npm is needed (Debian packages nodejs npm; run "
                      "bash .ci/setup)")
endif()
file(MAKE_DIRECTORY "${WORK}")
file(COPY "${SRC}/package.json" "${SRC}/package-lock.json" DESTINATION "${WORK}")
# --prefer-offline: a warm npm cache is enough, so repeated runs need no network.
execute_process(
  COMMAND "${NPM_EXE}" ci --no-audit --no-fund --prefer-offline
  WORKING_DIRECTORY "${WORK}"
  RESULT_VARIABLE npm_rc)
if(NOT npm_rc EQUAL 0)
  message(FATAL_ERROR "serve browser setup: 'npm ci' failed (${npm_rc}) in ${WORK}; "
                      "puppeteer-core 24.43.1 must come from the npm registry or the npm cache")
endif()
