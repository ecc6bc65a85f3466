// Minimal typing of the part of Eleventy's programmatic API that plumbline uses.
declare module '@11ty/eleventy' {
  interface EleventyOptions {
    quietMode?: boolean;
    configPath?: string;
    config?: (eleventyConfig: { addGlobalData: (key: string, value: unknown) => void }) => void | Promise<void>;
  }
  export default class Eleventy {
    constructor(input: string, output: string, options?: EleventyOptions);
    write(): Promise<unknown>;
    disableLogger(): void;
  }
}
