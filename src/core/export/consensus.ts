// The consensus of tags and rulings lives with the rulings (src/core/rulings); the export
// reads it from there so there is one rule for every page and file.
export { consensus, rulingInForce, siteConsensus, type Consensus, type ConsensusStatus } from '../rulings/consensus.ts';
