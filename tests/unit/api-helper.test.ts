// The online-only screens' fetch helper (components/ui/use-json.ts): a typed body on 2xx, else an
// ApiError with the server's code, message, details and fields; no answer is "offline"; the
// screens' words for each case come from problemText / problemList.
import { afterEach, describe, expect, it, vi } from "vitest";
import { ApiError, api, problemList, problemText } from "@/components/ui/use-json";

function answer(status: number, body: unknown, raw = false) {
  const fetchMock = vi.fn(
    async (_url: string, _init?: RequestInit) =>
      new Response(raw ? String(body) : JSON.stringify(body), {
        status,
        headers: { "content-type": raw ? "text/html" : "application/json" },
      }),
  );
  vi.stubGlobal("fetch", fetchMock);
  return fetchMock;
}

async function failure(p: Promise<unknown>): Promise<ApiError> {
  try {
    await p;
  } catch (e) {
    if (e instanceof ApiError) return e;
    throw e;
  }
  throw new Error("expected the call to fail");
}

afterEach(() => {
  vi.unstubAllGlobals();
});

describe("api()", () => {
  it("returns the body of a 2xx answer and sends a JSON body as JSON, never cached", async () => {
    const f = answer(201, { user: { name: "Ines Vartanian" } });
    const body = await api<{ user: { name: string } }>("/api/users", { json: { name: "Ines Vartanian" } });
    expect(body.user.name).toBe("Ines Vartanian");
    const [url, init = {}] = f.mock.calls[0]!;
    expect(url).toBe("/api/users");
    expect(init.method).toBe("POST");
    expect(init.cache).toBe("no-store");
    expect((init.headers as Record<string, string>)["content-type"]).toBe("application/json");
    expect(init.body).toBe('{"name":"Ines Vartanian"}');
  });

  it("sends raw bytes as application/octet-stream unless told otherwise, with the caller's headers", async () => {
    const f = answer(200, { rules: { version: 2 } });
    await api("/api/rules/document", { body: new Blob(["%PDF-"]), headers: { "x-rimelog-file-name": "a.pdf" } });
    const [, init = {}] = f.mock.calls[0]!;
    const headers = init.headers as Record<string, string>;
    expect(headers["content-type"]).toBe("application/octet-stream");
    expect(headers["x-rimelog-file-name"]).toBe("a.pdf");
  });

  it("throws the server's code, message, details and fields", async () => {
    answer(400, {
      error: {
        code: "bad_request:rules",
        message: "The rules are incomplete.",
        details: ["values.ppe: too many items"],
        fields: [{ path: "values.ppe", message: "too many items" }, { bad: true }],
      },
    });
    const e = await failure(api("/api/rules", { method: "PUT", json: {} }));
    expect(e.status).toBe(400);
    expect(e.code).toBe("bad_request:rules");
    expect(e.message).toBe("The rules are incomplete.");
    expect(e.details).toEqual(["values.ppe: too many items"]);
    expect(e.fields).toEqual([{ path: "values.ppe", message: "too many items" }]);
    expect(e.offline).toBe(false);
    expect(e.text).toBe("The rules are incomplete. values.ppe: too many items");
    expect(problemText(e, "offline words")).toBe("The rules are incomplete.");
    expect(problemText(e, "offline words", true)).toBe("The rules are incomplete. values.ppe: too many items");
  });

  it("works with an error answer that has no fields (a server from before they were added)", async () => {
    answer(409, {
      error: { code: "conflict:rules", message: "Someone else changed the rules meanwhile.", details: [] },
    });
    const e = await failure(api("/api/rules"));
    expect(e.fields).toEqual([]);
    expect(problemList(e)).toEqual([]);
  });

  it("lists the refused inputs when the server names only fields", async () => {
    answer(400, {
      error: {
        code: "bad_request:user",
        message: "Not added.",
        fields: [{ path: "email", message: "not an address" }],
      },
    });
    const e = await failure(api("/api/users", { json: {} }));
    expect(problemList(e)).toEqual(["email: not an address"]);
  });

  it("names the status when something in between answered with a page, not JSON", async () => {
    answer(502, "<html>Bad gateway</html>", true);
    const e = await failure(api("/api/mail"));
    expect(e.status).toBe(502);
    expect(e.code).toBe("http:502");
    expect(e.message).toBe("The server answered 502.");
  });

  it("refuses a 2xx answer it cannot read", async () => {
    answer(200, "<html>captive portal</html>", true);
    const e = await failure(api("/api/me"));
    expect(e.code).toBe("bad_answer");
  });

  it("is offline when no answer came, and the screen's own words are shown then", async () => {
    vi.stubGlobal(
      "fetch",
      vi.fn(async () => {
        throw new TypeError("Failed to fetch");
      }),
    );
    const e = await failure(api("/api/users"));
    expect(e.offline).toBe(true);
    expect(e.status).toBe(0);
    expect(e.message).toBe("No connection to the server.");
    expect(problemText(e, "No connection to the server: nothing was changed.")).toBe(
      "No connection to the server: nothing was changed.",
    );
  });
});
