import * as rruleModule from 'rrule';

// Node loads rrule's CommonJS build, whose exports sit on `default`; bundlers load its ES build,
// which has no default. Every domain module takes rrule from here so both builds work.
type RruleModule = typeof rruleModule;
const rrule: RruleModule = (Reflect.get(rruleModule, 'default') as RruleModule | undefined) ?? rruleModule;

export const { RRule, rrulestr } = rrule;
