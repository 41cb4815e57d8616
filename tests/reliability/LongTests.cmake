# Long runs of the reliability suite, kept out of the default test run
# (`ctest --label-exclude long`). Run them with `ctest -L long`.
# tst_reliability itself (label unit) runs a short kill test of 20 cycles.
add_test(NAME reliability_kill_long COMMAND tst_reliability)
set_tests_properties(reliability_kill_long PROPERTIES
  LABELS "long"
  ENVIRONMENT "QT_QPA_PLATFORM=offscreen;ROUTEBOOK_RELIABILITY_SUITE=kill;ROUTEBOOK_KILL_ITERATIONS=250;QTEST_FUNCTION_TIMEOUT=7000000"
  TIMEOUT 7200)
