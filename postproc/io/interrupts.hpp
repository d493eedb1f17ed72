// Interrupted runs end clean: SIGINT, SIGTERM and SIGHUP remove the staging folders of unfinished
// output folders (RunFolder) before the process ends. No signal handler runs the clean-up: the
// signals are blocked in every thread and one thread waits for them with sigwait, so the clean-up
// is ordinary code (no async-signal-safety limits) and waits for a commit under way.
#pragma once

namespace oxystrat {

//! Call once at the start of main, before any other thread starts: the signals are blocked in the
//! calling thread and so in every thread started after it. On a signal the process ends with
//! that signal's own status (as if uncaught), after abandon_run_folders().
void clean_up_on_interrupt();

}  // namespace oxystrat
