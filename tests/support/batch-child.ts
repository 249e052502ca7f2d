// A process that runs a batch of fits through the ordinary service and prints one line per event,
// for the crash test to kill mid-batch: argv[2] is the manuscript, argv[3…] the version ids.
import { runBatch } from "@/lib/server/analyses/batch";

const author = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };
const [manuscriptId, ...versionIds] = process.argv.slice(2);
for await (const event of runBatch(author, { manuscriptId: manuscriptId!, versionIds, model: "relaxation", options: { x: "wait", y: "p" } })) {
  console.log(JSON.stringify({ type: event.type }));
}
