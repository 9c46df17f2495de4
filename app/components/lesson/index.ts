// Every component a lesson's MDX can use, by the name it uses. (<Equation tex="…" /> gets its math
// rendered when the lesson is compiled: see app/lib/lesson-equations.server.ts.)
import { DataTable } from "./data-table";
import { Equation } from "./equation";
import { Exercise } from "./exercise";
import { ForceChart } from "./force-chart";
import { Caution, Hint } from "./notes";
import { PhotoUpload } from "./photo-upload";
import { AfterPrediction, Prediction } from "./prediction";
import { ReadingsEntry } from "./readings-entry";
import { WrittenAnswer } from "./written-answer";

export const lessonComponents = {
  AfterPrediction,
  Caution,
  DataTable,
  Equation,
  Exercise,
  ForceChart,
  Hint,
  PhotoUpload,
  Prediction,
  ReadingsEntry,
  WrittenAnswer,
};
