export { ASCENT_RULES, LOW_ORBIT_MARGIN, apoapsisBurn, ascentFigures, lowOrbitAltitude } from './ascent.ts';
export type { AscentFigures } from './ascent.ts';
export {
  CALENDAR_RESOLUTION,
  CALENDAR_WITHIN,
  CALENDAR_YEARS,
  MAX_CALENDAR_YEARS,
  TOF_SAMPLES_PER_PERIOD,
  assembleCalendar,
  calendarPair,
  pairPorkchopRequest,
  planetPairs,
  resolveCalendarRequest,
  windowCalendar,
} from './calendar.ts';
export type {
  Calendar,
  CalendarOptions,
  CalendarPair,
  CalendarPairRequest,
  CalendarRequest,
  CalendarWindow,
  ResolvedCalendar,
  ResolvedPair,
} from './calendar.ts';
export { DEFAULT_MAP_SAMPLES, MAP_TOF_SPAN, deltaVMap, escapeBurn, hohmannEstimate, mapPath, mapTransferRequest } from './deltaVMap.ts';
export type { DeltaVMap, DeltaVMapOptions, MapEdge, MapEdgeKind, MapNode, MapNodeKind } from './deltaVMap.ts';
