// Temporary forward, to be deleted in the merge of issue 10: lib/groom/place.ts and lib/groom/trace.ts
// still import the halfedge helpers from this old path, and lib/groom is being moved on another branch.
// Once they import `nextAroundVertex, nextHalfedge, prevHalfedge, type Topology` from '../field', delete this file.
export { nextAroundVertex, nextHalfedge, prevHalfedge, type Topology } from './mesh/topology';
