// Public surface of lib/limits: rule resolution, the verdict, presets and rule checks.
// Pure and framework-free: the same code runs in the browser (offline) and on the server.
export * from './types';
export { VERDICT_ORDER, verdictRank, worstLevel, trips } from './levels';
export { isIsoDate } from './dates';
export { resolveLimits, createLimitResolver, findResolved, versionInForce, scopeMatches, scopeSpecificity, limitSlots, type LimitResolver } from './resolve';
export { judge } from './judge';
export { PRESETS, MEMORY_NOTE, getPreset, applyPreset, type LimitPreset, type PresetRule } from './presets';
export { checkRule, checkProfileVersion, type RuleFieldError } from './validate';
export { compareRuleSets, type RuleComparison, type RuleChangeKind } from './compare';
