// Property tests (fast-check) draw from a fixed seed so a run is reproducible: a failure in CI shows
// up the same way on a developer's machine. Change the seed locally to explore more cases.
import fc from 'fast-check';

fc.configureGlobal({ seed: 20261201 });
