#include "postproc/io/interrupts.hpp"

#include <pthread.h>
#include <signal.h>

#include <thread>

#include "postproc/io/run_folder.hpp"

namespace oxystrat {

void clean_up_on_interrupt() {
  static bool started = false;
  if (started) return;
  started = true;
  sigset_t set;
  sigemptyset(&set);
  for (int s : {SIGINT, SIGTERM, SIGHUP}) sigaddset(&set, s);
  if (pthread_sigmask(SIG_BLOCK, &set, nullptr) != 0) return;  // signals keep their default action
  std::thread([set] {
    int sig = 0;
    while (sigwait(&set, &sig) != 0) {
    }
    abandon_run_folders();
    // End as the signal would have: the parent sees "killed by SIGINT", not an exit code.
    ::signal(sig, SIG_DFL);
    sigset_t one;
    sigemptyset(&one);
    sigaddset(&one, sig);
    pthread_sigmask(SIG_UNBLOCK, &one, nullptr);
    ::raise(sig);
  }).detach();
}

}  // namespace oxystrat
