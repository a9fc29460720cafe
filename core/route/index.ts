/**
 * Front door of core/route. Routes from intent: the hops between two bodies of the body tree, the
 * event sequence of each hop (window, escape, transfer, capture), and the whole plan targeted.
 * Other folders of core/ and the app import from here only.
 */
export { ROUTE_HOP_WORDS, routeChain } from './chain.ts';
export type { RouteHopKind, RouteLink } from './chain.ts';
export { checkIntent, SOI_FRACTION } from './intent.ts';
export type { CheckedIntent, RouteIntent } from './intent.ts';
export { planRoute } from './planRoute.ts';
export type { RouteHop, RouteOptions, RouteResult } from './planRoute.ts';
