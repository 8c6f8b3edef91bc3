import { describe, expect, it } from "vitest";
import { KEYWORD_REPLY, KEYWORDS, LANGUAGES, channelsFor, inQuietWindow, keywordForm, keywordOf, noticeBody, parseClock, quietUntil, shopLanguages, toE164 } from "@/lib/texts";

describe("phone numbers to E.164", () => {
  it("keeps international numbers and reads national ones only in NANP shops", () => {
    // ITU-T E.164: "+", country code, at most 15 digits. 7700 900123 is an Ofcom drama number (UK).
    expect(toE164("+44 7700 900123", "GBP")).toBe("+447700900123");
    expect(toE164("0044 7700 900123", "EUR")).toBe("+447700900123");
    // North American Numbering Plan: NXX-NXX-XXXX with N = 2–9; 555-01xx is reserved for fiction.
    expect(toE164("(303) 555-0142", "USD")).toBe("+13035550142");
    expect(toE164("1 303 555 0142", "CAD")).toBe("+13035550142");
    expect(toE164("303 555 0142", "GBP")).toBeNull();
    expect(toE164("(103) 555-0142", "USD")).toBeNull();
    expect(toE164("+1234", "USD")).toBeNull();
    expect(toE164("call me", "USD")).toBeNull();
  });
});

describe("keywords (CTIA Messaging Principles and Best Practices, opt-out and HELP)", () => {
  it("reads the standard words whatever the case, spaces or closing punctuation", () => {
    for (const word of ["STOP", "stop", " Stop! ", "Unsubscribe.", "end", "cancel", "quit", "stopall", "opt out", "revoke"]) expect(keywordOf(word, ["en"], false)?.keyword, word).toBe("stop");
    for (const word of ["START", "unstop"]) expect(keywordOf(word, ["en"], true)?.keyword, word).toBe("start");
    for (const word of ["help", "INFO?"]) expect(keywordOf(word, ["en"], false)?.keyword, word).toBe("help");
  });

  it("leaves sentences alone, and YES opts back in only a number that opted out", () => {
    expect(keywordOf("Please stop the work on the clutch", ["en"], false)).toBeNull();
    expect(keywordOf("yes", ["en"], false)).toBeNull();
    expect(keywordOf("yes", ["en"], true)?.keyword).toBe("start");
  });
});

describe("keywords in the shop's other languages", () => {
  it("reads the carriers' Spanish and Canadian French words, whatever the case or accents", () => {
    // Spanish-language US short codes answer ALTO and AYUDA in Spanish (Twilio, "Industry Standards for
    // Spanish-language Short Code campaigns"); INICIO as the Spanish START (support.textizen.com,
    // "Reserved Keywords"); PARAR: common carrier practice, no published source.
    for (const word of ["ALTO", "alto", "¡Alto!", "parar", "Parar."]) expect(keywordOf(word, ["en", "es"], false), word).toEqual({ keyword: "stop", language: "es" });
    for (const word of ["AYUDA", "ayuda?", "¿Ayuda?"]) expect(keywordOf(word, ["en", "es"], false), word).toEqual({ keyword: "help", language: "es" });
    expect(keywordOf("Inicio", ["en", "es"], true)).toEqual({ keyword: "start", language: "es" });
    // CWTA Canadian Common Short Code Application Guidelines v3.9 (as quoted by Infobip and Twilio):
    // ARRET and AIDE are mandatory and answered in French; accents aside, ARRÊT is the same word.
    for (const word of ["ARRET", "ARRÊT", "arrêt", "Arrêt !", "ARRÉT"]) expect(keywordOf(word, ["en", "fr"], false), word).toEqual({ keyword: "stop", language: "fr" });
    for (const word of ["AIDE", "aide", "Aidé"]) expect(keywordOf(word, ["en", "fr"], false), word).toEqual({ keyword: "help", language: "fr" });
  });

  it("honours an opt-out word in every language, and leaves a language's other words alone for a shop that doesn't text in it", () => {
    // Whoever asks to stop is stopped, in any language we know (47 CFR § 64.1200(a)(12): revocation
    // "by any reasonable means"; section from memory, unverified).
    expect(keywordOf("ALTO", ["en"], false)).toEqual({ keyword: "stop", language: "es" });
    expect(keywordOf("ARRÊT", ["en", "es"], false)).toEqual({ keyword: "stop", language: "fr" });
    expect(keywordOf("AYUDA", ["en", "fr"], false)).toBeNull();
    expect(keywordOf("AIDE", ["en", "es"], false)).toBeNull();
    expect(keywordOf("INICIO", ["en"], true)).toBeNull();
    expect(keywordOf("stop", ["en", "es", "fr"], false)).toEqual({ keyword: "stop", language: "en" });
    expect(keywordOf("INFO", ["en", "fr"], false)).toEqual({ keyword: "help", language: "en" });
    // Sentences are replies in every language.
    expect(keywordOf("Alto el trabajo en el embrague", ["en", "es"], false)).toBeNull();
    expect(keywordOf("Aide-moi avec la facture", ["en", "fr"], false)).toBeNull();
  });

  it("no word means two things: within and across the languages, every word is one keyword", () => {
    const seen = new Map<string, string>();
    for (const language of LANGUAGES)
      for (const [keyword, words] of Object.entries(KEYWORDS[language]))
        for (const word of words) {
          const form = keywordForm(word);
          expect(seen.get(form), `${word} (${language} ${keyword})`).toBeUndefined();
          seen.set(form, `${language} ${keyword}`);
        }
  });

  it("reads the shop's setting, English first and always", () => {
    expect(shopLanguages({ sms_languages: "en" })).toEqual(["en"]);
    expect(shopLanguages({ sms_languages: "fr,en,es" })).toEqual(["en", "es", "fr"]);
    expect(shopLanguages({ sms_languages: "es" })).toEqual(["en", "es"]);
    expect(shopLanguages({ sms_languages: "en,de" })).toEqual(["en"]);
    expect(shopLanguages({ sms_languages: null })).toEqual(["en"]);
  });

  it("answers in the keyword's language, starting with the shop's name", () => {
    const shop = { name: "Saltmarsh Small Engines", phone: "+1 303 555 0142", email: "desk@saltmarsh.test" };
    for (const language of LANGUAGES)
      for (const keyword of ["stop", "start", "help"] as const) expect(KEYWORD_REPLY[language][keyword](shop), `${language} ${keyword}`).toMatch(/^Saltmarsh Small Engines: /);
    expect(KEYWORD_REPLY.es.stop(shop)).toBe("Saltmarsh Small Engines: ya no le enviaremos mensajes. Responda INICIO para recibirlos de nuevo.");
    expect(KEYWORD_REPLY.es.help(shop)).toContain("Llame al +1 303 555 0142 o escriba a desk@saltmarsh.test.");
    expect(KEYWORD_REPLY.fr.help(shop)).toContain("Appelez le +1 303 555 0142 ou écrivez à desk@saltmarsh.test.");
    // The French answers name the words that work: ARRET to stop, START (no French opt-in word) to resume.
    expect(KEYWORD_REPLY.fr.stop(shop)).toContain("Répondez START");
    expect(KEYWORD_REPLY.fr.start(shop)).toContain("Répondez ARRET");
    // No way to reach the shop given: no dangling "Call" or double full stop.
    const bare = { name: "Saltmarsh Small Engines", phone: null, email: null };
    expect(KEYWORD_REPLY.en.help(bare)).toBe("Saltmarsh Small Engines: texts about your repair jobs. Reply STOP to stop. Message and data rates may apply.");
    expect(KEYWORD_REPLY.en.help({ ...bare, email: "desk@saltmarsh.test" })).toContain("jobs. E-mail desk@saltmarsh.test. Reply STOP");
  });
});

describe("quiet hours on the shop's clock", () => {
  // Default 21:00–08:00 (47 CFR § 64.1200(c)(1) hours, kept for service texts: common carrier practice).
  const quiet = { start: 21 * 60, end: 8 * 60 };

  it("wraps midnight", () => {
    expect(inQuietWindow(20 * 60 + 59, quiet.start, quiet.end)).toBe(false);
    expect(inQuietWindow(21 * 60, quiet.start, quiet.end)).toBe(true);
    expect(inQuietWindow(3 * 60, quiet.start, quiet.end)).toBe(true);
    expect(inQuietWindow(8 * 60, quiet.start, quiet.end)).toBe(false);
    expect(inQuietWindow(600, 600, 600)).toBe(false);
  });

  it("holds until the morning in the shop's time zone", () => {
    // IANA tz database: America/Denver is UTC−7 in January, Europe/London UTC+1 in July (BST).
    expect(quietUntil(new Date("2030-01-10T05:30:42Z"), "America/Denver", quiet)?.toISOString()).toBe("2030-01-10T15:00:00.000Z");
    expect(quietUntil(new Date("2030-01-10T18:00:00Z"), "America/Denver", quiet)).toBeNull();
    expect(quietUntil(new Date("2030-07-01T21:15:00Z"), "Europe/London", quiet)?.toISOString()).toBe("2030-07-02T07:00:00.000Z");
  });

  it("reads the settings' clock times", () => {
    expect(parseClock("21:00")).toBe(1260);
    expect(parseClock("7:30")).toBe(450);
    expect(parseClock("24:00")).toBeNull();
  });
});

describe("wording and channels", () => {
  it("every text carries the shop's name and how to stop", () => {
    expect(noticeBody("  Saltmarsh\nSmall Engines ", "Your mower is ready.")).toBe("Saltmarsh Small Engines: Your mower is ready. Reply STOP to stop.");
  });

  it("honours the owner's choice, falling back to e-mail when a text can't go", () => {
    expect(channelsFor("email", true)).toEqual({ email: true, text: false });
    expect(channelsFor("text", true)).toEqual({ email: false, text: true });
    expect(channelsFor("text", false)).toEqual({ email: true, text: false });
    expect(channelsFor("both", true)).toEqual({ email: true, text: true });
  });
});
