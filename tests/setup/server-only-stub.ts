// Tests run server modules directly under Node: the "server-only" marker has nothing to guard there.
export {};
