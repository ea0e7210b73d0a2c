# Runs the threaded factorisation of test_blas_threading.cpp on the pthreads OpenBLAS (its folder
# in LD_LIBRARY_PATH, which comes before the program's run path) and on the OpenMP OpenBLAS the
# program links, and checks that both finish, ran on the build asked for, and give the same bits.
# Arguments: PROGRAM, PTHREADS_DIR, WORK_DIR.
foreach(build pthreads openmp)
  set(bits ${WORK_DIR}/blas_bits_${build}.txt)
  file(REMOVE ${bits})
  set(env --unset=OMP_THREAD_LIMIT --unset=LD_LIBRARY_PATH)
  if(build STREQUAL "pthreads")
    list(APPEND env LD_LIBRARY_PATH=${PTHREADS_DIR})
  endif()
  execute_process(
    COMMAND ${CMAKE_COMMAND} -E env ${env} SHARPEY_BLAS_BITS_FILE=${bits} ${PROGRAM}
            --gtest_filter=BlasThreading.ThreadedFactorisationFinishes
    RESULT_VARIABLE status)
  if(NOT status EQUAL 0 OR NOT EXISTS ${bits})
    message(FATAL_ERROR "the factorisation on the ${build} OpenBLAS failed (status ${status})")
  endif()
  file(STRINGS ${bits} lines_${build})
  list(GET lines_${build} 0 used)
  if(NOT used STREQUAL "blas ${build}")
    message(FATAL_ERROR "asked for the ${build} OpenBLAS, ran on: ${used}")
  endif()
  list(SUBLIST lines_${build} 1 -1 solution_${build})
  message(STATUS "${build}: ${lines_${build}}")
endforeach()
if(NOT solution_pthreads STREQUAL solution_openmp)
  message(FATAL_ERROR "the OpenMP and pthreads builds differ: ${solution_openmp} against "
                      "${solution_pthreads}")
endif()
