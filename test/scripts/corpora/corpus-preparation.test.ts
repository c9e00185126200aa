import { describe, expect, it } from "vitest";
import { languageLabel, cleanMessage } from "../../../scripts/corpora/catalog-languages.ts";
import { isTestGroup } from "../../../scripts/corpora/corpus-writer.ts";
import { longDescriptionText, readParagraphs } from "../../../scripts/corpora/deb822.ts";
import { plainText, toctreeEntries } from "../../../scripts/corpora/library-docs.ts";
import { threadKey } from "../../../scripts/corpora/spam-assassin-mail.ts";

describe("corpus preparation", () => {
  it("should join deb822 continuation lines and keep paragraphs apart", () => {
    // Debian Policy 5.1: continuation lines start with a space; paragraphs are separated by empty lines.
    const paragraphs = [...readParagraphs("Package: a\nTag: role::program,\n scope::utility\n\nPackage: b\n")];
    expect(paragraphs.map((p) => p.get("Package"))).toEqual(["a", "b"]);
    expect(paragraphs[0].get("Tag")).toBe("role::program,\nscope::utility");
  });

  it("should turn a long description's lone dots into paragraph breaks", () => {
    // Debian Policy 5.6.13: a line holding only " ." is an empty line of the description.
    expect(longDescriptionText(" A tool\n that does x.\n .\n More.")).toBe("A tool that does x.\n\nMore.");
  });

  it("should keep every row of a group on one side of the split", () => {
    const sides = new Set(Array.from({ length: 50 }, () => isTestGroup("c", "group-7")));
    expect(sides.size).toBe(1);
    const testShare = Array.from({ length: 5000 }, (_, i) => isTestGroup("c", `g${i}`)).filter(Boolean).length / 5000;
    expect(testShare).toBeGreaterThan(0.18);
    expect(testShare).toBeLessThan(0.22);
  });

  it("should label locales by language and script, and skip quote variants", () => {
    expect(["pt_BR", "zh_TW", "zh_CN", "sr@latin", "ca@valencia", "en@quot", "no"].map(languageLabel)).toEqual([
      "pt", "zh-Hant", "zh-Hans", "sr@latin", "ca", null, "nb",
    ]);
    expect(cleanMessage("_Öffnen %s <b>jetzt</b> %1$d")).toBe("Öffnen jetzt");
  });

  it("should group a thread's messages by their subject without reply prefixes", () => {
    expect(threadKey("Re: [SAdev] RE: Bug 123")).toBe("bug 123");
    expect(threadKey("Re: ")).toBeNull();
  });

  it("should read toctree entries and reduce reST markup to text", () => {
    expect(toctreeEntries(".. toctree::\n   :maxdepth: 2\n\n   string.rst\n   re.rst\n\nText")).toEqual(["string", "re"]);
    expect(plainText(":func:`wrap` wraps *text* with ``width``.").trim()).toBe("wrap wraps text with width.");
  });
});
