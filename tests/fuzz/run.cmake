# The fuzz test: configures and builds the libFuzzer targets with clang in WORK (a folder of
# the build tree), then runs each for SECONDS on its seed corpus (tests/fuzz/corpus/TARGET)
# and the inputs earlier runs found (WORK/corpus/TARGET). Any crash, hang, leak, memory blow-up
# or sanitizer report fails, naming the reproducer saved under WORK/artifacts.
#
#   cmake -DSRC=<source> -DWORK=<build>/fuzz -DSECONDS=60 -P tests/fuzz/run.cmake
cmake_minimum_required(VERSION 3.20)
foreach(v SRC WORK SECONDS)
  if(NOT DEFINED ${v})
    message(FATAL_ERROR "fuzz: -D${v}=... is required")
  endif()
endforeach()

find_program(LIMITLINE_CLANGXX NAMES clang++ clang++-14)
if(NOT LIMITLINE_CLANGXX)
  message(FATAL_ERROR "fuzz: clang++ not found; install the Debian packages 'clang' and "
                      "'libclang-rt-14-dev' (bash .ci/setup)")
endif()

set(build ${WORK}/build)
file(MAKE_DIRECTORY ${WORK})
execute_process(
  COMMAND ${CMAKE_COMMAND} -S ${SRC} -B ${build} -DCMAKE_CXX_COMPILER=${LIMITLINE_CLANGXX}
          -DCMAKE_BUILD_TYPE=RelWithDebInfo -DLIMITLINE_FUZZ=ON -DLIMITLINE_BUILD_TESTS=OFF
          -DLIMITLINE_BUILD_BENCHMARKS=OFF
  OUTPUT_FILE ${WORK}/configure.log ERROR_FILE ${WORK}/configure.log RESULT_VARIABLE rc)
if(NOT rc EQUAL 0)
  file(READ ${WORK}/configure.log log)
  message(FATAL_ERROR "fuzz: configuring the fuzz build failed:\n${log}")
endif()
execute_process(
  COMMAND ${CMAKE_COMMAND} --build ${build} -j2 --target limitline_fuzzers
  OUTPUT_FILE ${WORK}/build.log ERROR_FILE ${WORK}/build.log RESULT_VARIABLE rc)
if(NOT rc EQUAL 0)
  file(READ ${WORK}/build.log log)
  message(FATAL_ERROR "fuzz: building the fuzz targets failed:\n${log}")
endif()

# Inputs are capped at 4 KiB: long enough for a unit file or a few hundred rows, short enough
# that each run tries many of them.
set(ENV{UBSAN_OPTIONS} "print_stacktrace=1")
file(GLOB targets ${SRC}/tests/fuzz/fuzz_*.cpp)
set(failed "")
foreach(src ${targets})
  get_filename_component(name ${src} NAME_WE)
  set(corpus ${WORK}/corpus/${name})
  file(MAKE_DIRECTORY ${corpus} ${WORK}/artifacts)
  set(log ${WORK}/${name}.log)
  math(EXPR guard "${SECONDS} + 120")
  execute_process(
    COMMAND ${build}/tests/fuzz/${name} -max_total_time=${SECONDS} -timeout=10
            -rss_limit_mb=2048 -max_len=4096 -print_final_stats=1
            -artifact_prefix=${WORK}/artifacts/${name}- ${corpus} ${SRC}/tests/fuzz/corpus/${name}
    OUTPUT_FILE ${log} ERROR_FILE ${log} RESULT_VARIABLE rc TIMEOUT ${guard})
  file(STRINGS ${log} stats REGEX "^stat::number_of_executed_units")
  if(rc EQUAL 0)
    message(STATUS "fuzz: ${name}: clean for ${SECONDS} s (${stats})")
  else()
    file(STRINGS ${log} lines)
    list(LENGTH lines n)
    math(EXPR from "${n} - 40")
    if(from LESS 0)
      set(from 0)
    endif()
    list(SUBLIST lines ${from} 40 tail)
    list(JOIN tail "\n" tail)
    message("fuzz: ${name} FAILED (${rc}); the reproducer is the file named below, log ${log}:\n${tail}")
    list(APPEND failed ${name})
  endif()
endforeach()
if(failed)
  message(FATAL_ERROR "fuzz: failed: ${failed}; rerun one with: ${build}/tests/fuzz/TARGET FILE")
endif()
