// When each part of the worker's start ran: name -> [start, end], ms from the worker's start
// (its time origin). The parts overlap (the snapshot is read while the wasm compiles), so each
// keeps its own span. The worker hands them over with "ready"; sitebuild/bench.py reads
// them back from self.bootPhases to break the first answer's time into its parts.
export const phases = {};
self.bootPhases = phases;

// `work`'s span under `name`: a promise (from now until it settles) or a function run now.
export function timed(name, work) {
  const start = performance.now();
  const done = () => { phases[name] = [Math.round(start), Math.round(performance.now())]; };
  if (typeof work === "function") {
    try {
      return work();
    } finally {
      done();
    }
  }
  return work.then((value) => { done(); return value; }, (err) => { done(); throw err; });
}
