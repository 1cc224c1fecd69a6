/**
 * The scene records, one import for their callers: reads (what a venue offers a scene, lists,
 * analyses, history, JSON) and writes (create, save, duplicate, remove). What a save changed is
 * described by the shared `$lib/scenes/changes`.
 */
export * from './reads';
export * from './writes';
