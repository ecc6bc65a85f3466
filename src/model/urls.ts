// The report's addresses: permanent, since reviewers paste them into change requests. Light on
// purpose (the SARIF log and change-request summaries link to them without loading the report).
export const urls = {
  rule: (id: string) => `/rules/${id}/`,
  structure: (id: string) => `/structures/${id}/`,
  verdict: (rule: string, structure: string) => `/rules/${rule}/${structure}/`,
  engine: (id: string) => `/methods/${id}/`,
  quantity: (name: string) => `/methods/${name.split('.')[0]}/#${name.replace('.', '-')}`,
  waivers: '/waivers/',
  waiver: (id: string) => `/waivers/${id}/`,
  audit: '/audit/',
};
