# CI runs exactly the README's test command: the command line of .ci/run must be the second
# command of the README's Quick start, character for character. -DSRC=source tree
file(READ ${SRC}/README.md readme)
string(FIND "${readme}" "## Quick start" start)
if(start EQUAL -1)
  message(FATAL_ERROR "README.md has no '## Quick start' section")
endif()
string(SUBSTRING "${readme}" ${start} -1 quick)
# The fenced blocks of the section, in order: the first builds and runs, the second tests.
string(REGEX MATCHALL "```\n[^`]*```" blocks "${quick}")
list(LENGTH blocks n)
if(n LESS 2)
  message(FATAL_ERROR "README.md Quick start has fewer than two commands")
endif()
list(GET blocks 1 block)
string(REGEX REPLACE "^```\n(.*)\n```$" "\\1" readme_command "${block}")

file(STRINGS ${SRC}/.ci/run lines)
set(ci_command "")
foreach(line ${lines})
  if(NOT line MATCHES "^(#|set |cd |$)")
    set(ci_command "${line}")
  endif()
endforeach()
if(NOT ci_command STREQUAL readme_command)
  message(FATAL_ERROR ".ci/run and the README's test command differ:\n"
                      "  .ci/run: ${ci_command}\n  README:  ${readme_command}")
endif()
