// The part of Eleventy's programmatic API that loopsheet uses (the package ships no types).
declare module '@11ty/eleventy' {
  interface EleventyOptions {
    configPath?: string;
    quietMode?: boolean;
    /** `ignores`: the paths Eleventy leaves out, relative to the working directory (docs: Ignore Template Files). */
    config?: (eleventyConfig: { addGlobalData: (name: string, value: unknown) => void; ignores: Set<string> }) => void;
  }
  export default class Eleventy {
    constructor(input?: string, output?: string, options?: EleventyOptions);
    disableLogger(): void;
    /** The passthrough copies, and each page written with its output path and content (Eleventy 2.0+). */
    write(): Promise<[unknown, Array<{ outputPath: string | false; content: string }>]>;
  }
}
