# `trivet example` prints a file that `trivet check` accepts.
execute_process(COMMAND ${TRIVET} example OUTPUT_FILE ${OUT} RESULT_VARIABLE rc)
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "trivet example exited ${rc}")
endif()
execute_process(COMMAND ${TRIVET} check ${OUT} RESULT_VARIABLE rc OUTPUT_VARIABLE out)
# The starter's claims are a hand calculation rounded to three figures: they hold.
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "trivet check on the starter file exited ${rc}:\n${out}")
endif()
