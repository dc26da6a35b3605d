// Reconciling disagreements: the queue of patches needing a ruling, the consensus of
// tags and rulings, and the rule that overriding everyone needs a reason.
export { consensus, rulingInForce, siteConsensus, type Consensus, type ConsensusStatus } from './consensus.ts';
export { overridesEveryone, reasonProblem } from './overrideRule.ts';
export {
  disagreementQueue, filterQueue, queueProgress, speciesPairs, DISAGREEMENT_KINDS,
  type DisagreementKind, type QueueFilter, type QueueInput, type QueueItem, type QueueProgress, type RevealedCall,
} from './queue.ts';
export { itemAtPlace, type QueuePlace } from './place.ts';
export { settledSheet, type DisagreementTally, type PassAgainstSettled, type SettledOn, type SettledSheet } from './settledSheet.ts';
export { RulingError } from './RulingError.ts';
export { unmatchedOutlines, type UnmatchedOutline } from './unmatchedOutlines.ts';
