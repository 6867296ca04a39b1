/** One worker thread of the app's pool (lib/work/pool.ts): serves the jobs of lib/work/jobs.ts. */
import { jobs } from "./jobs";
import { serveJobs } from "./serve";

serveJobs(jobs);
