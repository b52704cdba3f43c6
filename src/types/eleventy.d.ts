// The part of Eleventy's programmatic API that loopsheet uses (the package ships no types).
declare module '@11ty/eleventy' {
  interface EleventyOptions {
    configPath?: string;
    quietMode?: boolean;
    config?: (eleventyConfig: { addGlobalData: (name: string, value: unknown) => void }) => void;
  }
  export default class Eleventy {
    constructor(input?: string, output?: string, options?: EleventyOptions);
    disableLogger(): void;
    write(): Promise<unknown>;
  }
}
