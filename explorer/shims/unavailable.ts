// Node-only modules have no place in the browser page: the solver never calls them there (the library is built
// from the bundled JSON and passed in). Each stub throws, naming what was called, if that ever changes.
export function unavailable(name: string): (...args: unknown[]) => never {
  return () => {
    throw new Error(`${name} is not available in the browser explorer`);
  };
}
