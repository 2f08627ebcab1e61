export { decodePid, type DecodePidResult, type Finding, parsePid, type ParsePidResult, pidDefinition } from './decode-pid';
export { PID_DEFINITIONS, type PidDefinition, PIDS, type PidValue } from './pid-table';
