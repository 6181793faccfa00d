// on-headers ships no types; this is the one call the server makes.
declare module "on-headers" {
  import type { ServerResponse } from "node:http";

  export default function onHeaders(response: ServerResponse, listener: () => void): void;
}
