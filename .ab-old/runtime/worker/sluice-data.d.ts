// Model files imported by the Worker entry are Data modules: workerd hands them over as an
// ArrayBuffer (wrangler.toml: [[rules]] type = "Data" globs = ["**/*.sluice"]).
declare module "*.sluice" {
  const data: ArrayBuffer;
  export default data;
}
