/**
 * PostgreSQL advisory lock taken (per transaction) by every change of the road graph's overlay:
 * a reference-network upload and the switch to a newly imported extract, so the two never build
 * the overlay from each other's half-written state. Any fixed number unique to this use.
 */
export const ROAD_GRAPH_LOCK = 7_412_309_001;
