# Hostile input, faults and limits (included from tests/harness_tests.cmake):
# the bad-input corpus and the limits, the JSON Schema, and the program's
# behaviour under faults (broken pipes, kills, odd directory entries).
trivet_add_test(corpus_test ${CMAKE_CURRENT_SOURCE_DIR}/corpus_test.cpp trivet_compare)
target_compile_definitions(corpus_test PRIVATE TRIVET_CORPUS_DIR="${CMAKE_CURRENT_SOURCE_DIR}/corpus"
                                               TRIVET_EXE="$<TARGET_FILE:trivet>")
add_dependencies(corpus_test trivet)

trivet_add_test(schema_test ${CMAKE_CURRENT_SOURCE_DIR}/schema_test.cpp trivet_input nlohmann_json::nlohmann_json)
target_compile_definitions(schema_test PRIVATE TRIVET_SCHEMA_FILE="${PROJECT_SOURCE_DIR}/harness/input/beam-file.schema.json")

# The schema against the reader (python3-jsonschema; skipped, not passed, without it).
find_program(TRIVET_PYTHON3 python3)
add_test(NAME schema_agrees_with_reader
  COMMAND ${TRIVET_PYTHON3} ${CMAKE_CURRENT_SOURCE_DIR}/corpus/schema_check.py
          --trivet $<TARGET_FILE:trivet> --schema ${PROJECT_SOURCE_DIR}/harness/input/beam-file.schema.json
          --root ${PROJECT_SOURCE_DIR})
set_tests_properties(schema_agrees_with_reader PROPERTIES SKIP_RETURN_CODE 77)

add_test(NAME robustness COMMAND bash ${CMAKE_CURRENT_SOURCE_DIR}/robustness.sh $<TARGET_FILE:trivet> ${PROJECT_SOURCE_DIR})
set_tests_properties(robustness PROPERTIES TIMEOUT 600)
