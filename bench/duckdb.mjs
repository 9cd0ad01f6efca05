// acidlot bench: the same assay in DuckDB, as a peer measured in the same
// run (bench/run.sh): read the titration CSV, TA per row as citric acid
// (E = 192.1235 / 3 / 1000 g/meq, the catalogue's; METHODS.md s.1), group
// by product, lot and sample, count, mean, sample SD and RSD, join with
// the specification, the verdict (retest below min_n or above max_rsd_pct,
// else pass inside [min, max], else fail), the results written as CSV in
// input order. Two threads, as acidlot gets.
// usage: node bench/duckdb.mjs TITRATIONS SPEC OUTPUT
import { DuckDBInstance } from '@duckdb/node-api';

const [, , input, spec, out] = process.argv;
const db = await DuckDBInstance.create(':memory:', { threads: '2' });
const c = await db.connect();
const q = (s) => s.replaceAll("'", "''");
await c.run(`COPY (
  WITH r AS (
    SELECT product, lot, sample,
           titrant_ml * titrant_mol_l * (192.1235 / 3 / 1000) * 100 / mass_g AS ta,
           row_number() OVER () AS rn
    FROM read_csv('${q(input)}', header = true))
  SELECT r.product, r.lot, r.sample, count(*) AS n, avg(ta) AS mean,
         stddev_samp(ta) AS sd, 100 * stddev_samp(ta) / avg(ta) AS rsd_pct,
         CASE WHEN count(*) < s.min_n
                   OR 100 * stddev_samp(ta) / avg(ta) > s.max_rsd_pct THEN 'retest'
              WHEN avg(ta) BETWEEN s.min AND s.max THEN 'pass'
              ELSE 'fail' END AS status
  FROM r JOIN read_csv('${q(spec)}', header = true) s ON s.product = r.product
  GROUP BY r.product, r.lot, r.sample, s.min, s.max, s.max_rsd_pct, s.min_n
  ORDER BY min(rn)
) TO '${q(out)}' (HEADER, DELIMITER ',')`);
