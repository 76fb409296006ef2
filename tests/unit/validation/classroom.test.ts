import { describe, expect, it } from "vitest";

import {
  classroomInputSchema,
  classroomSettingsSchema,
  classroomSignInSchema,
  enrolStudentsSchema,
  joinClassroomSchema,
  moveStudentSchema,
  sessionInputSchema,
} from "@/lib/validation/classroom";

/** The first message per field, as the forms show it (fieldErrorsFromZod). */
function messages(result: {
  success: boolean;
  error?: { issues: Array<{ path: PropertyKey[]; message: string }> };
}) {
  const out: Record<string, string> = {};
  for (const i of result.error?.issues ?? []) out[i.path.map(String).join(".")] ??= i.message;
  return out;
}

describe("classroomInputSchema", () => {
  const valid = {
    name: "Year 8 science club",
    school: "Harbour Lane School",
    termStart: "2026-09-07",
    termEnd: "2026-12-18",
    capacity: "30",
  };

  it("accepts form text and turns the size limit into a number", () => {
    expect(classroomInputSchema.parse(valid)).toEqual({ ...valid, capacity: 30 });
  });

  it("refuses a term that ends first, a term over a year, a date that does not exist and an empty name", () => {
    expect(messages(classroomInputSchema.safeParse({ ...valid, termEnd: "2026-09-01" }))).toEqual({
      termEnd: "The term ends before it starts.",
    });
    expect(messages(classroomInputSchema.safeParse({ ...valid, termEnd: "2027-12-18" })).termEnd).toContain(
      "at most a year",
    );
    expect(
      messages(classroomInputSchema.safeParse({ ...valid, termStart: "2026-02-30" })).termStart,
    ).toContain("not a calendar date");
    expect(messages(classroomInputSchema.safeParse({ ...valid, name: " " })).name).toBe(
      "Enter the class name.",
    );
    expect(messages(classroomInputSchema.safeParse({ ...valid, capacity: "0" })).capacity).toContain(
      "at least 1",
    );
    expect(messages(classroomInputSchema.safeParse({ ...valid, capacity: "" })).capacity).toBe(
      "Enter the class size limit.",
    );
  });

  it("refuses fields it does not know", () => {
    expect(classroomInputSchema.safeParse({ ...valid, educatorUserId: "someone" }).success).toBe(false);
  });
});

describe("classroomSettingsSchema", () => {
  it("reads unticked checkboxes as false", () => {
    expect(classroomSettingsSchema.parse({ classroomId: "c1", capacity: "20" })).toEqual({
      classroomId: "c1",
      capacity: 20,
      joinOpen: false,
      compareWithOthers: false,
    });
    expect(
      classroomSettingsSchema.parse({ classroomId: "c1", capacity: "20", joinOpen: "on" }).joinOpen,
    ).toBe(true);
  });
});

describe("enrolStudentsSchema", () => {
  it("takes one display name per line, ignoring blank lines and spaces", () => {
    expect(
      enrolStudentsSchema.parse({ classroomId: "c1", displayNames: "  Ava   P.\r\n\nBen K.\n" }).displayNames,
    ).toEqual(["Ava P.", "Ben K."]);
  });

  it("refuses e-mail addresses, names without letters, names listed twice and an empty list", () => {
    expect(
      messages(enrolStudentsSchema.safeParse({ classroomId: "c1", displayNames: "ava@example.test" }))[
        "displayNames.0"
      ],
    ).toBe("Use a first name and an initial, not an e-mail address.");
    expect(
      messages(enrolStudentsSchema.safeParse({ classroomId: "c1", displayNames: "12" }))["displayNames.0"],
    ).toBe("A display name needs at least one letter.");
    expect(
      messages(enrolStudentsSchema.safeParse({ classroomId: "c1", displayNames: "Ava P.\nava p" }))
        .displayNames,
    ).toContain("listed twice");
    expect(
      messages(enrolStudentsSchema.safeParse({ classroomId: "c1", displayNames: "\n \n" })).displayNames,
    ).toContain("at least one display name");
    expect(
      messages(
        enrolStudentsSchema.safeParse({
          classroomId: "c1",
          displayNames: "A very long full name of a pupil here",
        }),
      )["displayNames.0"],
    ).toContain("at most 30");
  });

  it("accepts names from many languages", () => {
    expect(
      enrolStudentsSchema.parse({ classroomId: "c1", displayNames: "Zoë O’Neill\nŁucja W.\nAroha-Rose T." })
        .displayNames,
    ).toHaveLength(3);
  });
});

describe("sessionInputSchema", () => {
  const valid = {
    classroomId: "c1",
    title: "Week 1",
    day: "2026-10-07",
    opensAt: "10:00",
    closesAt: "11:15",
    instrumentName: "Class pinhole box",
    instrumentKind: "pinhole",
  };

  it("gives the window as UT instants", () => {
    const parsed = sessionInputSchema.parse(valid);
    expect(parsed.opensAtUt.toISOString()).toBe("2026-10-07T10:00:00.000Z");
    expect(parsed.closesAtUt.toISOString()).toBe("2026-10-07T11:15:00.000Z");
  });

  it("refuses a window that closes first, one longer than six hours, a bad time and an unknown kind", () => {
    expect(messages(sessionInputSchema.safeParse({ ...valid, closesAt: "10:00" })).closesAt).toBe(
      "The session must close after it opens, on the same UT day.",
    );
    expect(
      messages(sessionInputSchema.safeParse({ ...valid, opensAt: "08:00", closesAt: "14:30" })).closesAt,
    ).toBe("A session can be open for at most 6 hours.");
    expect(messages(sessionInputSchema.safeParse({ ...valid, opensAt: "25:00" })).opensAt).toContain(
      "24-hour time",
    );
    expect(
      messages(sessionInputSchema.safeParse({ ...valid, instrumentKind: "naked-eye" })).instrumentKind,
    ).toBe("Choose the kind of instrument set up for the class.");
  });
});

describe("moveStudentSchema", () => {
  it("refuses moving a student into the classroom they are in", () => {
    expect(
      messages(
        moveStudentSchema.safeParse({ classroomId: "c1", studentUserId: "s1", targetClassroomId: "c1" }),
      ).targetClassroomId,
    ).toBe("Choose a different classroom to move to.");
  });
});

describe("classroomSignInSchema and joinClassroomSchema", () => {
  it("tidies the code and keeps extra fields next-auth sends out of the way", () => {
    expect(
      classroomSignInSchema.parse({ code: "sun hls8", displayName: "Ava P.", pin: "4821", csrfToken: "t" }),
    ).toEqual({ code: "SUN-HLS8", displayName: "Ava P.", pin: "4821" });
  });

  it("says what a PIN looks like", () => {
    expect(
      messages(classroomSignInSchema.safeParse({ code: "SUN-HLS8", displayName: "Ava P.", pin: "48a1" })).pin,
    ).toBe("Your PIN is the 4 digits on your sign-in card.");
    expect(
      messages(classroomSignInSchema.safeParse({ code: "SUN-HLS8", displayName: "Ava P.", pin: "" })).pin,
    ).toBe("Enter your PIN.");
  });

  it("asks for a code and a name to join", () => {
    expect(messages(joinClassroomSchema.safeParse({ code: "", displayName: "" }))).toMatchObject({
      code: expect.stringContaining("classroom code"),
      displayName: expect.any(String),
    });
  });
});
