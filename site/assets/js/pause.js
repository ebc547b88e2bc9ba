// A task that runs once a pause follows the last call that asked for it: one timer
// for a burst of calls, not one set and cleared per call.
//
// Every keystroke asks for three such tasks (the URL written, the parts off screen
// caught up, the values' titles written). Clearing and setting a timer for each on
// every keystroke took about 1 ms of the bend page's input handler at 4x CPU (a
// profile of 30 edits). Here a call only moves the task's due time; the one timer,
// when it fires before that time, waits again for the rest.
//
// Also `whenIdle`: a task for the browser's idle time, with a timer where the
// browser has no idle callbacks.

/** Due times closer than this (ms) count as reached: a timer may fire a little early. */
const PAUSE_SLACK_MS = 1;

/**
 * `task` runs `ms` after the last `restart()`. `postpone()` moves the due time of a
 * task that waits (and starts none); `cancel()` forgets it; `pending()` says
 * whether it waits.
 */
export function afterPause(task, ms) {
  let due = 0;
  let timer = 0;
  function fire() {
    const left = due - performance.now();
    if (left > PAUSE_SLACK_MS) {
      timer = setTimeout(fire, left);
      return;
    }
    timer = 0;
    task();
  }
  return {
    restart() {
      due = performance.now() + ms;
      if (!timer) timer = setTimeout(fire, ms);
    },
    postpone() {
      if (timer) due = performance.now() + ms;
    },
    cancel() {
      if (timer) clearTimeout(timer);
      timer = 0;
    },
    pending() {
      return timer !== 0;
    },
  };
}

/**
 * Runs `task` when the browser is idle, at the latest `timeoutMs` later; a browser
 * without `requestIdleCallback` waits `fallbackMs` instead. Returns a handle for
 * `cancelIdle`.
 */
export function whenIdle(task, timeoutMs, fallbackMs) {
  return "requestIdleCallback" in window ? requestIdleCallback(task, { timeout: timeoutMs }) : setTimeout(task, fallbackMs);
}

/** Forgets a task `whenIdle` scheduled. */
export function cancelIdle(handle) {
  ("cancelIdleCallback" in window ? cancelIdleCallback : clearTimeout)(handle);
}
