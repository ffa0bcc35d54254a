"use client";
/** Typed uploadthing hooks for the app's upload route (/api/uploadthing, lib/uploads/log-file-router.ts). */
import { generateReactHelpers } from "@uploadthing/react";
import type { AppLogFileRouter } from "@/lib/uploads/log-file-router";

export const { useUploadThing } = generateReactHelpers<AppLogFileRouter>({ url: "/api/uploadthing" });
