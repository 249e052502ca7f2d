// A process that exports a figure's bundle through the ordinary service, for the crash test to kill
// mid-export: argv[2] is the figure id. Prints "exporting" before it starts and "exported" after.
import { exportFigure } from "@/lib/server/export/export-figure";

const pi = { id: "demo-pi", email: "pi@lab.example.org", name: "Mira Halvorsen" };
console.log("exporting");
const { body } = await exportFigure(pi, process.argv[2]!, { format: "bundle", dpi: 300, colour: "rgb", text: "outlines", mark: "on" });
console.log(`exported ${body.byteLength}`);
