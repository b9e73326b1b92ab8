/** Waveform measurements on exact closed forms. */
export { computeMetrics } from './metrics.js';
export {
  evaluatePieces,
  evaluatePiecesDerivative,
  evaluatePiecesBefore,
  pieceValue,
  pieceDerivative,
  termValue,
  termDerivative,
} from './evaluate.js';
export { findRoot } from './root.js';
export { buildTrack, stretchesOf, type Track, type Stretch } from './track.js';
export { findPeakAndValley, type Extremum } from './extrema.js';
export { firstReach } from './crossing.js';
export { riseTime, type RiseTime } from './rise.js';
export { overshootPercent } from './overshoot.js';
export { settlingTime, bandHalfWidth } from './settling.js';
export { steadyStateLimit } from './limit.js';
export { delay50, ringing, maxSlope, averageAndRms, lastIntervalTerms, type WeightedTerm } from './shape.js';
export { timeAbove, traceTimeAbove, type TimeAbove } from './above.js';
export { undershootPercent, eventShoots, EVENT_OF_SWING, type EventShoot } from './undershoot.js';
