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
    /** The passthrough copies, and each page written with its output path and content (Eleventy 2.0+). */
    write(): Promise<[unknown, Array<{ outputPath: string | false; content: string }>]>;
  }
}
