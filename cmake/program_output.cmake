# Runs PROGRAM with ARGS (a ;-list) and writes what it prints to OUT, replacing OUT only when the program
# succeeds. With GZIP, also OUT.gz, compressed as Debian installs manual pages (gzip -9n: no name, no time).
# Usage: cmake -DPROGRAM=... -DARGS=... -DOUT=... [-DGZIP=ON] -P program_output.cmake
execute_process(COMMAND ${PROGRAM} ${ARGS} OUTPUT_FILE ${OUT}.tmp RESULT_VARIABLE status)
if(NOT status EQUAL 0)
  file(REMOVE ${OUT}.tmp)
  message(FATAL_ERROR "${PROGRAM} ${ARGS} failed (${status})")
endif()
file(RENAME ${OUT}.tmp ${OUT})
if(GZIP)
  find_program(GZIP_PROGRAM gzip REQUIRED)
  execute_process(COMMAND ${GZIP_PROGRAM} -9n -c ${OUT} OUTPUT_FILE ${OUT}.gz RESULT_VARIABLE status)
  if(NOT status EQUAL 0)
    message(FATAL_ERROR "gzip ${OUT} failed (${status})")
  endif()
endif()
