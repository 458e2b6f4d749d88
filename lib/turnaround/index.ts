// The turnaround clock: service time in the unit's calendar, promises and lateness.
export {
  WEEKDAYS,
  serviceCalendarSchema,
  type ServiceCalendar,
  type Weekday,
  type WorkingInterval,
} from "./calendar";
export { addServiceTime, isOpen, nextOpening, serviceMinutesBetween } from "./clock";
export { TurnaroundError, type TurnaroundErrorCode, type TurnaroundIssue } from "./errors";
export { isLate, turnaroundOutcome, type TurnaroundOutcome, type TurnaroundOutcomeInput } from "./outcome";
export {
  DEFAULT_TRANSIT_MINUTES,
  SERVICE_LEVELS,
  planReturn,
  promisedReturn,
  type PlanReturnInput,
  type ReturnPlan,
  type ReturnSuggestion,
  type ServiceLevel,
  type TurnaroundHours,
} from "./promise";
export { cycleClock, cycleTurnaround, type CycleClock, type CycleClockTerms, type CycleClockTimes } from "./cycle";
