'use strict';
/**
 * The V8 flags the CLI launcher (scripts/cli-launcher.cjs) sets for a short run, by node's major version. A CLI run is
 * short, and on a 2-core machine V8's optimising compiler, not our code, is its critical path: a cold `size` of the
 * demo spec spent over half its instructions in TurboFan (valgrind), while the functions waiting for it ran
 * unoptimised. Less inlining, no loop peeling and a later tier-up cut that run by about a quarter (interleaved
 * whole-process runs, README "Performance"), warm speed unchanged.
 *
 * V8 prints an error for a flag it does not know (and the launcher cannot ask which it knows without a second
 * process), so each major gets only flags its V8 has, read off `node --v8-options` of node 18.20, 20.20, 21.7, 22.23
 * and 24.22: `--interrupt-budget` (the later tier-up) is gone from node 21 on (V8 counts invocations there instead),
 * the TurboFan flags are in all of them. Other majors get none. On node 22 and 24 the two TurboFan flags still cut
 * the demo `size` (5 interleaved runs on a loaded host: 2.40 -> 1.69 s and 2.02 -> 1.77 s), though both ran it
 * slower than node 20 did.
 */
function v8FlagsFor(major) {
  if (major >= 18 && major <= 20) return '--no-turbo-inlining --no-turbo-loop-peeling --interrupt-budget=200000';
  if (major >= 21 && major <= 24) return '--no-turbo-inlining --no-turbo-loop-peeling';
  return '';
}

module.exports = { v8FlagsFor };
