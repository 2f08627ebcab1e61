// Preloaded into the service by the load benchmark (`node --require`): counts the SQL statements the service sends
// at the driver (every query of a `pg` client, BEGIN and COMMIT included) and, on SIGUSR2, writes that count and
// the process's CPU time so far to the file named in TRACEBAY_BENCH_STATS. Not part of the service.
const { writeFileSync } = require('node:fs');
const pg = require('pg');

const file = process.env.TRACEBAY_BENCH_STATS;
let statements = 0;
let seq = 0;
const query = pg.Client.prototype.query;
pg.Client.prototype.query = function (...args) {
  statements++;
  return query.apply(this, args);
};
process.on('SIGUSR2', () => {
  const cpu = process.cpuUsage();
  writeFileSync(file, JSON.stringify({ seq: ++seq, statements, cpuMs: (cpu.user + cpu.system) / 1000 }));
});
