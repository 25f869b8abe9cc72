import request from "supertest";
import { DEMO_PASSWORD } from "@/db/seeds/01_shop";

export const BASE_URL = process.env.APP_URL ?? "http://127.0.0.1:3199";

type Method = "get" | "post" | "put" | "patch" | "delete";

/**
 * A supertest agent that keeps its cookies and sends this site's Origin on every request, as a
 * browser on a Blockyard page would. `client` sets X-Forwarded-For so throttling tests do not
 * share one address.
 */
export function client(opts: { origin?: string | null; address?: string } = {}) {
  const agent = request.agent(BASE_URL);
  const origin = opts.origin === undefined ? BASE_URL : opts.origin;
  const address = opts.address ?? `10.9.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}`;
  const call = (method: Method, path: string) => {
    let r = agent[method](path).set("X-Forwarded-For", address);
    if (origin) r = r.set("Origin", origin);
    return r;
  };
  return {
    agent,
    get: (p: string) => call("get", p),
    post: (p: string, body?: object) => call("post", p).send(body ?? {}),
    put: (p: string, body?: object) => call("put", p).send(body ?? {}),
    patch: (p: string, body?: object) => call("patch", p).send(body ?? {}),
    delete: (p: string) => call("delete", p),
    call,
    async signIn(email: string, password = DEMO_PASSWORD) {
      const res = await call("post", "/api/auth/sign-in").send({ email, password });
      if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
      return res;
    },
  };
}

export type Client = ReturnType<typeof client>;

export const demoEmail = (role: string) => `${role}@demo.blockyard.test`;
