// Test helper: drain a reader into an array, keeping the report it filled in.

import {
  createReadReport,
  readExamplesFromText,
  type Example,
  type ReadOptions,
  type ReadReport,
} from "../../../compiler/read/index.ts";

/** Every example of an async generator, in order. */
export async function collectExamples(examples: AsyncIterable<Example>): Promise<Example[]> {
  const all: Example[] = [];
  for await (const example of examples) all.push(example);
  return all;
}

/** Reads in-memory data to the end; returns the examples and the report. */
export async function readAllFromText(
  name: string,
  text: string,
  options: ReadOptions = {},
): Promise<{ examples: Example[]; report: ReadReport }> {
  const report = createReadReport(name);
  const examples = await collectExamples(readExamplesFromText(name, text, options, report));
  return { examples, report };
}

/** The error a read throws (failing the test if it does not throw). */
export async function readError(name: string, text: string, options: ReadOptions = {}): Promise<unknown> {
  try {
    await readAllFromText(name, text, options);
  } catch (error) {
    return error;
  }
  throw new Error(`expected reading ${name} to throw`);
}
