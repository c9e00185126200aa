// The pinned inputs and outputs of `npm run corpora` (scripts/corpora/pins.json): every
// input package or file by version and SHA-256, every output file by SHA-256. A pinned
// input that differs stops the preparation; `npm run corpora -- --update-pins` records new
// values instead (and says so), for when the pins are meant to move.
import { createHash } from "node:crypto";
import { readFileSync, writeFileSync, existsSync } from "node:fs";

export const PINS_FILE = new URL("./pins.json", import.meta.url);

export interface Pin {
  version?: string;
  sha256: string;
}

export interface Pins {
  inputs: Record<string, Pin>;
  outputs: Record<string, string>;
}

/** SHA-256 of bytes, as lower-case hex. */
export function sha256(bytes: Uint8Array | string): string {
  return createHash("sha256").update(bytes).digest("hex");
}

export class PinBook {
  readonly changed: string[] = [];
  private readonly pins: Pins;

  constructor(private readonly update: boolean) {
    this.pins = existsSync(PINS_FILE) ? (JSON.parse(readFileSync(PINS_FILE, "utf8")) as Pins) : { inputs: {}, outputs: {} };
  }

  /** The pinned version of an input, if any (a download asks for exactly this version). */
  pinnedVersion(key: string): string | undefined {
    return this.pins.inputs[key]?.version;
  }

  /** Checks an input against its pin; refuses a difference unless updating. */
  checkInput(key: string, actual: Pin): void {
    const pinned = this.pins.inputs[key];
    if (pinned && pinned.sha256 === actual.sha256 && pinned.version === actual.version) return;
    if (!this.update) {
      const expected = pinned ? `${pinned.version ?? ""} sha256 ${pinned.sha256}` : "no pin";
      throw new Error(
        `input ${key} is ${actual.version ?? ""} sha256 ${actual.sha256}, pinned: ${expected}. ` +
          `The corpora would differ from the recorded ones; run \`npm run corpora -- --update-pins\` only if the pins are meant to move.`,
      );
    }
    this.pins.inputs[key] = actual;
    this.changed.push(`input ${key}`);
  }

  /** Checks an output's hash against its pin (a difference means the preparation is not reproducible). */
  checkOutput(key: string, actual: string): void {
    const pinned = this.pins.outputs[key];
    if (pinned === actual) return;
    if (!this.update) {
      throw new Error(
        `output ${key} has sha256 ${actual}, pinned ${pinned ?? "nothing"}: the same inputs gave a different corpus. ` +
          `If the preparation code changed on purpose, run \`npm run corpora -- --update-pins\`.`,
      );
    }
    this.pins.outputs[key] = actual;
    this.changed.push(`output ${key}`);
  }

  save(): void {
    if (this.changed.length === 0) return;
    const sorted = (record: Record<string, unknown>) => Object.fromEntries(Object.entries(record).sort(([a], [b]) => a.localeCompare(b)));
    writeFileSync(PINS_FILE, `${JSON.stringify({ inputs: sorted(this.pins.inputs), outputs: sorted(this.pins.outputs) }, null, 2)}\n`);
  }
}
