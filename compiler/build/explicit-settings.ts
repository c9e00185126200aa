// Which settings the user chose. The build's search and its recovery from divergence change
// only the others: an explicit flag (or config key) always wins.

import { BUILD_SETTINGS, defaultBuildSettings, type BuildSettings } from "./build-settings.ts";

/**
 * The explicit settings: the list the CLI passes (flags and config keys), or, for programmatic
 * callers who pass none, every setting whose value differs from the table's default.
 * @example explicitSettings({ ...defaultBuildSettings(), epochs: 9 }).has("epochs") // true
 */
export function explicitSettings(settings: BuildSettings, explicit?: readonly (keyof BuildSettings)[]): Set<keyof BuildSettings> {
  if (explicit) return new Set(explicit);
  const defaults = defaultBuildSettings();
  const found = new Set<keyof BuildSettings>();
  for (const key of Object.keys(BUILD_SETTINGS) as (keyof BuildSettings)[]) {
    if (JSON.stringify(settings[key]) !== JSON.stringify(defaults[key])) found.add(key);
  }
  return found;
}
