// The part of Eleventy's dev server that `loopsheet serve` uses (the package ships no types).
declare module '@11ty/eleventy-dev-server' {
  interface RequestContext {
    url: URL;
  }
  type OnRequestResult = string | { status?: number; headers?: Record<string, string>; body?: string } | undefined;
  interface DevServerOptions {
    liveReload?: boolean;
    domDiff?: boolean;
    showVersion?: boolean;
    portReassignmentRetryCount?: number;
    messageOnStart?: (info: { hosts: string[] }) => string;
    onRequest?: Record<string, (context: RequestContext) => OnRequestResult | Promise<OnRequestResult>>;
    logger?: { info: (message: string) => void; log: (message: string) => void; error: (message: string) => void };
  }
  export default class EleventyDevServer {
    static getServer(name: string, dir: string, options?: DevServerOptions): EleventyDevServer;
    serve(port: number): void;
    ready(): Promise<void>;
    getPort(): Promise<number>;
    reload(event?: { files?: string[] }): void;
    augmentContentWithNotifier(content: string, inlineContents?: boolean): string;
    close(): Promise<void>;
  }
}
