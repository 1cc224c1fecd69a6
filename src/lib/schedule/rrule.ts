import * as rruleModule from 'rrule';

// rrule ships CommonJS for Node and ES modules for bundlers: the named exports exist only when
// bundled, so fall back to the CommonJS default when running unbundled (scripts, plain Node).
type RRuleModule = typeof rruleModule;
const namespace: Record<string, unknown> = rruleModule;
const loaded = (namespace.RRule !== undefined ? namespace : namespace['default']) as RRuleModule;

export const RRule = loaded.RRule;
export type RRule = rruleModule.RRule;
export type RRuleOptions = rruleModule.Options;
