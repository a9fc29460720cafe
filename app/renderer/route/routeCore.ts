/**
 * The route builder of core/route as the app sees it: the one place the renderer names it, so the
 * analysis worker, the route store and the panel import it from here.
 */
export type { RouteHop, RouteIntent, RouteResult } from '../../../core/route/index.ts';
export { ROUTE_HOP_WORDS, planRoute } from '../../../core/route/index.ts';
