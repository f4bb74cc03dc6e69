const t0 = performance.now();
const { solveContact } = await import('./dist/contact.js');
const t1 = performance.now();
const o = { metal: 'Pt', support: 'ZnO', donors: '1e17 cm^-3', temperature: '473 K' };
solveContact(o);
console.log(process.execArgv.join(' ') || 'none', 'import', (t1 - t0).toFixed(0), 'solve', (performance.now() - t1).toFixed(0));
