// A process that stores one upload through the ordinary service, for the crash test to kill
// mid-way: argv[2] is the file, argv[3] the manuscript. The environment names the database and store.
import fs from "node:fs";
import { importDatasetFromBytes } from "@/lib/server/datasets/upload-dataset";

const author = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };
const bytes = new Uint8Array(fs.readFileSync(process.argv[2]!));
await importDatasetFromBytes(author, process.argv[3]!, "crash-sweep.csv", bytes, { name: "Killed upload" });
console.log("stored");
