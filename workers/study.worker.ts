// Study worker: runs a contiguous batch of study tasks with the same lib/sim core as
// everywhere else. A thin comlink `expose`; the pool owns splitting, progress and cancel.
import * as Comlink from "comlink";
import { simulate } from "@/lib/sim";
import { runStudyTasks, type StudyRequest, type TaskOutput } from "@/lib/studies/study";

const api = {
  runBatch(request: StudyRequest, start: number, end: number): TaskOutput[] {
    return runStudyTasks(request, start, end, simulate);
  },
};

export type StudyWorkerApi = typeof api;

Comlink.expose(api);
