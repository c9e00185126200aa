// The shapes callers of the data readers see: the formats, the options and one example.

/** The data file formats the readers understand. */
export type DataFormat = "csv" | "tsv" | "jsonl";

/** One labelled (or, for classification, unlabelled) text read from a data file. */
export interface Example {
  /** The text fields joined with "\n", in the order they were requested. */
  text: string;
  /** Trimmed, non-empty, without duplicates; [] only when labels are not required. */
  labels: string[];
  /** 1-based line of the file where the record starts. */
  line: number;
  /** The value of the group field (rows of one origin), when one was asked for. */
  group?: string;
}

/** How to read a data file; every key is optional. */
export interface ReadOptions {
  /** Default: from the file extension (.csv, .tsv/.tab, .jsonl/.ndjson/.json). */
  format?: DataFormat;
  /** Fields that hold the text, joined with "\n" in this order. Default ["text"]. */
  textFields?: string[];
  /** Field that holds the label(s). Default "label". */
  labelField?: string;
  /** Field naming each row's origin (a document, a thread, a source): rows of one group stay on one side of a split. */
  groupField?: string;
  /** Splits one label cell (or JSONL label string) into several labels. */
  labelSep?: string;
  /** Default true. When false the label field may be absent and examples may have no labels. */
  requireLabels?: boolean;
  /** Default false: the first bad row throws a DataError. When true bad rows are counted and skipped. */
  skipBad?: boolean;
}
