export declare const DEFAULT_PORT: number;
export interface StartServerOptions {
  /** Port to listen on; 0 takes any free port, a busy port moves on to the next few. Default 5217. */
  port?: number;
  /** The built renderer. Default: <repo>/dist. */
  root?: string;
  /** The demo folder served at /demo/. Default: <repo>/demo. */
  demoDir?: string;
  /** Told about requests that failed inside the server. */
  log?: (line: string) => void;
}
export interface RunningServer {
  /** e.g. http://127.0.0.1:5217/ */
  url: string;
  port: number;
  close(): Promise<void>;
}
export declare function startServer(options?: StartServerOptions): Promise<RunningServer>;
