import { describe, expect, it } from "vitest";
import { NotLoopback, checkLocalServiceHosts, isLoopback, loopbackHost, urlHost } from "@/scripts/loopback";

describe("the password-less local Postgres and S3 fake listen on loopback only", () => {
  it("knows loopback addresses", () => {
    for (const h of [
      "127.0.0.1",
      "127.1.2.3",
      "::1",
      "[::1]",
      "0:0:0:0:0:0:0:1",
      "localhost",
      " LOCALHOST ",
      "::ffff:127.0.0.1",
    ])
      expect(isLoopback(h), h).toBe(true);
    for (const h of [
      "0.0.0.0",
      "::",
      "*",
      "",
      "192.168.1.20",
      "10.0.0.5",
      "128.0.0.1",
      "127.0.0.256",
      "127.0.0.01",
      "1.127.0.0.1",
      "127.0.0.1,0.0.0.0",
      "127.0.0.1 0.0.0.0",
      "localhost.example.com",
      "db.internal",
      "::ffff:10.0.0.1",
      "fe80::1",
    ])
      expect(isLoopback(h), h).toBe(false);
  });

  it("takes an unset or blank variable as 127.0.0.1 and a loopback value as given", () => {
    expect(loopbackHost("BLOCKYARD_PG_HOST", undefined)).toBe("127.0.0.1");
    expect(loopbackHost("BLOCKYARD_PG_HOST", "  ")).toBe("127.0.0.1");
    expect(loopbackHost("BLOCKYARD_PG_HOST", "::1")).toBe("::1");
    expect(loopbackHost("BLOCKYARD_S3_HOST", "[::1]")).toBe("::1");
    expect(loopbackHost("BLOCKYARD_S3_HOST", "localhost")).toBe("localhost");
    expect(urlHost("::1")).toBe("[::1]");
    expect(urlHost("127.0.0.1")).toBe("127.0.0.1");
  });

  it("refuses any other address with a message naming the variable and what to do instead", () => {
    expect(() => loopbackHost("BLOCKYARD_PG_HOST", "0.0.0.0")).toThrow(NotLoopback);
    expect(() => loopbackHost("BLOCKYARD_PG_HOST", "0.0.0.0")).toThrow(
      "BLOCKYARD_PG_HOST=0.0.0.0 refused: the private PostgreSQL that npm start runs lets anyone in without a " +
        "password, so it listens on " +
        "this machine's loopback address only (127.0.0.1, ::1 or localhost), never on an address other machines can " +
        "reach. To use a PostgreSQL elsewhere (with a password), set DATABASE_URL and none is started.",
    );
    expect(() => loopbackHost("BLOCKYARD_S3_HOST", "192.168.1.20")).toThrow(
      /^BLOCKYARD_S3_HOST=192\.168\.1\.20 refused: the local S3 fake .* set S3_ENDPOINT/,
    );
  });

  it("checks both before npm start starts anything, skipping a service it will not start", () => {
    expect(() => checkLocalServiceHosts({})).not.toThrow();
    expect(() => checkLocalServiceHosts({ BLOCKYARD_PG_HOST: "::1", BLOCKYARD_S3_HOST: "localhost" })).not.toThrow();
    expect(() => checkLocalServiceHosts({ BLOCKYARD_PG_HOST: "*" })).toThrow(/^BLOCKYARD_PG_HOST=\*/);
    expect(() => checkLocalServiceHosts({ BLOCKYARD_S3_HOST: "0.0.0.0" })).toThrow(/^BLOCKYARD_S3_HOST=0\.0\.0\.0/);
    // With DATABASE_URL / S3_ENDPOINT set nothing local is started, so the host is not consulted.
    expect(() =>
      checkLocalServiceHosts({
        DATABASE_URL: "postgres://u:p@db.internal/blockyard",
        BLOCKYARD_PG_HOST: "0.0.0.0",
        S3_ENDPOINT: "https://s3.example.com",
        BLOCKYARD_S3_HOST: "0.0.0.0",
      }),
    ).not.toThrow();
  });
});
