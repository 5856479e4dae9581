// The web application end to end in a real browser: Debian's chromium (/usr/bin/chromium) driven by puppeteer-core
// (no browser download). A scratch lab is made with the plumb CLI; plumb serve runs on a free port; a technician logs
// in, records a weekly check (the live preview shows the verdict first), issues its certificate; a reviewer logs in,
// approves it with her password and downloads the PDF, whose text pdftotext must show; the technician records a pipette
// check (the live preview first), the reviewer voids it from the run's page with a reason and her password, the
// administrator adds a user on the users page, and, with JavaScript off, the technician previews and records a weekly
// check with plain form posts. Every page is saved as a screenshot. Usage: node e2e.js PATH/TO/plumb [SCREENSHOT_DIR]. If Chromium cannot start, this says so and fails.
"use strict";
const { execFileSync, spawn } = require("child_process");
const fs = require("fs");
const os = require("os");
const path = require("path");

const plumb = path.resolve(process.argv[2] || "build/plumb");
const shots = path.resolve(process.argv[3] || path.join(__dirname, "out"));
const chromium = "/usr/bin/chromium";

// A 1000 uL pipette's ten weighings on BAL-A (d = 0.1 mg, ISO 8655-6:2002 Table 1 asks 0.1 mg for 100 uL to
// 1000 uL). By hand: mean 997.20 mg; at 20 degC, 1013 hPa, 50 %RH, Z = 1.0028509 uL/mg (worked in
// tests/unit/pipette_check_test.cpp), so 997.20 x 1.0028509 = 1000.0429 uL; squared deviations sum 0.30 mg^2,
// s = sqrt(0.30 / 9) = 0.18257 mg = 0.1831 uL; far inside ISO 8655-2:2002's 8 uL and 3 uL: pass.
const pipetteWeighings = ["0.9972", "0.9970", "0.9974", "0.9971", "0.9973", "0.9969", "0.9972", "0.9975", "0.9971",
                          "0.9973"];
// Readings worked by hand in tests/unit/repeatability_test.cpp: mean 100.00023 g, s 0.0949 mg, bias +0.2 mg: pass.
const readings = ["100.0003", "100.0001", "100.0002", "100.0004", "100.0002", "100.0003", "100.0001", "100.0002",
                  "100.0003", "100.0002"];

let server = null; // plumb serve, stopped whatever happens

function fail(message) {
  console.error("browser test: FAILED: " + message);
  if (server) server.kill("SIGTERM");
  process.exit(1);
}

function makeLab(dir) {
  const env = Object.assign({}, process.env, { PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING: "1" });
  const db = path.join(dir, "lab.db");
  const secret = (name, text) => fs.writeFileSync(path.join(dir, name), text + "\n", { mode: 0o600 });
  const run = (args) => execFileSync(plumb, ["--db", db].concat(args), { cwd: dir, env, stdio: "pipe" });
  secret("admin.pw", "admin-password-for-the-test");
  run(["--password-file", "admin.pw", "init", "--lab", "Hillcrest Bench Lab", "--admin", "ada", "--admin-name",
       "Ada Quill"]);
  const people = [["quinn", "Quinn Adebayo", "quality-manager"], ["tess", "Tess Marlow", "technician"],
                  ["rhea", "Rhea Okafor", "reviewer"]];
  for (const [login, name, role] of people) {
    secret(login + "-first.pw", login + "-first-password");
    secret(login + ".pw", login + "-password-for-the-test");
    run(["--user", "ada", "--password-file", "admin.pw", "user", "add", login, "--name", name, "--role", role,
         "--new-password-file", login + "-first.pw"]);
    run(["--user", login, "--password-file", login + "-first.pw", "user", "password", "--new-password-file",
         login + ".pw"]);
  }
  const qm = ["--user", "quinn", "--password-file", "quinn.pw"];
  run(qm.concat(["weight", "add", "W100", "--nominal", "100g", "--class", "E2", "--correction", "0.03mg",
                 "--uncertainty", "0.05mg", "--k", "2", "--certificate", "RC-2291", "--calibrated", "2026-03-02",
                 "--due", "2027-03-02"]));
  run(qm.concat(["balance", "add", "BAL-A", "--capacity", "220g", "--readability", "0.1mg", "--every", "7d",
                 "--smallest-net", "200mg", "--location", "Room 2", "--since", "2026-01-05"]));
  run(qm.concat(["pipette", "add", "P-12", "--nominal", "1000uL", "--range", "fixed", "--every", "3mo", "--location",
                 "Lab 2", "--since", "2026-06-01"]));
  return db;
}

function startServer(db, dir) {
  return new Promise((resolve, reject) => {
    const child = spawn(plumb, ["--db", db, "serve", "--port", "0"], { cwd: dir, stdio: ["ignore", "pipe", "pipe"] });
    let out = "";
    const timer = setTimeout(() => reject(new Error("plumb serve did not start: " + out)), 20000);
    child.stdout.on("data", (d) => {
      out += d;
      const m = out.match(/(https?:\/\/127\.0\.0\.1:\d+\/)/);
      if (m) {
        clearTimeout(timer);
        resolve({ child, address: m[1] });
      }
    });
    child.stderr.on("data", (d) => { out += d; });
    child.on("exit", (code) => reject(new Error("plumb serve ended with " + code + ": " + out)));
  });
}

async function shot(page, name) {
  await page.screenshot({ path: path.join(shots, name + ".png"), fullPage: true });
  console.log("browser test: screenshot " + name + ".png of " + page.url());
}

// Waits for `selector` to read `text`; else fails with what the page shows instead (its refusals and the element).
async function waitForText(page, selector, text, what) {
  try {
    await page.waitForFunction((sel, want) => {
      const e = document.querySelector(sel);
      return e && e.textContent.trim() === want;
    }, { timeout: 15000 }, selector, text);
  } catch (e) {
    await shot(page, "failed-" + what);
    const shown = await page.$$eval("p.refusal:not([hidden]), " + selector, (all) => all.map((x) => x.textContent.trim()));
    fail(what + ": " + selector + " never read \"" + text + "\"; the page shows: " + JSON.stringify(shown));
  }
}

// The caret after the last character of a text box (below the header line it starts with).
async function toEndOf(page, selector) {
  await page.focus(selector);
  await page.keyboard.down("Control");
  await page.keyboard.press("End");
  await page.keyboard.up("Control");
}

async function logIn(page, address, login, password) {
  await page.goto(address + "login");
  await page.type("#login", login);
  await page.type("#password", password);
  await Promise.all([page.waitForNavigation(), page.click("button[type=submit].primary")]);
  if (!page.url().endsWith("/")) fail("log-in as " + login + " did not reach the overview: " + page.url());
}

async function main() {
  if (!fs.existsSync(plumb)) fail("no plumb binary at " + plumb);
  fs.mkdirSync(shots, { recursive: true });
  let puppeteer;
  try {
    puppeteer = require("puppeteer-core");
  } catch (e) {
    fail("puppeteer-core is not installed (run `npm ci` in tests/browser): " + e.message);
  }
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "plumb-browser-"));
  const db = makeLab(dir);
  const { child, address } = await startServer(db, dir);
  server = child;
  let browser;
  try {
    try {
      browser = await puppeteer.launch({
        executablePath: chromium,
        headless: true,
        // Root in a container has no user namespaces for Chromium's sandbox.
        args: process.getuid && process.getuid() === 0 ? ["--no-sandbox"] : [],
      });
    } catch (e) {
      fail("Chromium (" + chromium + ") could not start: " + e.message);
    }
    const page = await browser.newPage();
    await page.setViewport({ width: 1280, height: 900 });
    const refusedByPolicy = [];
    page.on("console", (m) => { if (/Content Security Policy/i.test(m.text())) refusedByPolicy.push(m.text()); });

    await page.goto(address);
    await shot(page, "01-login");
    await logIn(page, address, "tess", "tess-password-for-the-test");
    await shot(page, "02-overview-technician");

    await page.goto(address + "checks/new");
    await page.select("#balance", "BAL-A");
    await page.select("#weight", "W100");
    await page.click("#readings", { clickCount: 3 });
    await page.focus("#readings");
    await page.keyboard.press("End");
    await page.keyboard.type(readings.join("\n"));
    await page.waitForFunction(() => {
      const v = document.getElementById("preview-verdict");
      return v && v.textContent.trim() === "pass";
    }, { timeout: 15000 });
    const previewN = await page.$eval("#preview dl.figures dd", (e) => e.textContent.trim());
    if (previewN !== "10") fail("the preview shows n = " + previewN + ", not 10");
    await shot(page, "03-weekly-check-preview");

    await Promise.all([page.waitForNavigation(), page.click("#check-form button[value=record]")]);
    const verdict = await page.$eval("#verdict", (e) => e.textContent.trim());
    if (verdict !== "BAL-A: pass") fail("the recorded check says \"" + verdict + "\", not \"BAL-A: pass\"");
    await shot(page, "04-check-recorded");
    await Promise.all([page.waitForNavigation(), page.click("form[action='/certificates/issue'] button")]);
    const number = page.url().split("/").pop();
    const draft = await page.$eval("#state", (e) => e.textContent.trim());
    if (draft !== "draft") fail("the new certificate " + number + " is \"" + draft + "\", not a draft");
    await shot(page, "05-certificate-draft");
    await Promise.all([page.waitForNavigation(), page.click("form.leave button")]);

    await logIn(page, address, "rhea", "rhea-password-for-the-test");
    await page.goto(address + "certificates");
    await shot(page, "06-approval-queue");
    await Promise.all([page.waitForNavigation(), page.click("a[href='/certificates/" + number + "']")]);
    await page.type("#password", "rhea-password-for-the-test");
    await Promise.all([page.waitForNavigation(), page.click("form[action$='/approve'] button")]);
    const approved = await page.$eval("#state", (e) => e.textContent.trim());
    if (approved !== "approved") fail("after signing, certificate " + number + " is \"" + approved + "\"");
    const approval = await page.$eval("#approval", (e) => e.textContent);
    if (!approval.includes("Rhea Okafor") || !approval.includes("reviewed and approved"))
      fail("the approval line does not name Rhea Okafor and the meaning: " + approval);
    await shot(page, "07-certificate-approved");

    // The PDF as the browser downloads it from the link.
    const downloads = path.join(dir, "downloads");
    fs.mkdirSync(downloads);
    const cdp = await page.createCDPSession();
    await cdp.send("Browser.setDownloadBehavior", { behavior: "allow", downloadPath: downloads });
    await page.click("#download-pdf");
    const pdf = path.join(downloads, number + ".pdf");
    for (let waited = 0; !fs.existsSync(pdf); waited += 100) {
      if (waited > 20000) fail("the PDF " + number + ".pdf was not downloaded");
      await new Promise((r) => setTimeout(r, 100));
    }
    await new Promise((r) => setTimeout(r, 300));
    // Words as read, whatever the line breaks of the layout.
    const text = execFileSync("pdftotext", [pdf, "-"]).toString().replace(/\s+/g, " ");
    for (const expected of [number, "BAL-A", "Rhea Okafor", "reviewed and approved", "Tess Marlow"])
      if (!text.includes(expected)) fail("the PDF's text lacks \"" + expected + "\"");
    console.log("browser test: " + number + ".pdf holds the number, the balance, the operator and the signature");

    await Promise.all([page.waitForNavigation(), page.click("form.leave button")]);

    // The pipette check, with the server's live preview.
    await logIn(page, address, "tess", "tess-password-for-the-test");
    await page.goto(address + "pipette-checks/new");
    await page.select("#pipette", "P-12");
    await page.select("#balance", "BAL-A");
    await page.type("#water_temp", "20C");
    await page.type("#pressure", "1013hPa");
    await page.type("#humidity", "50%");
    await toEndOf(page, "#readings");
    await page.keyboard.type(pipetteWeighings.map((w) => "1000uL,1," + w).join("\n"));
    await waitForText(page, "#preview-verdict", "P-12: pass", "pipette-preview");
    await shot(page, "08-pipette-check-preview");
    await Promise.all([page.waitForNavigation(), page.click("#pipette-form button[value=record]")]);
    const pipetteVerdict = await page.$eval("#preview-verdict", (e) => e.textContent.trim());
    if (pipetteVerdict !== "P-12: pass") fail("the recorded pipette check says \"" + pipetteVerdict + "\"");
    const meanShown = await page.$eval("table.figures-table tbody tr td:nth-of-type(2)", (e) => e.textContent.trim());
    if (meanShown !== "1000.0429 µL") fail("the pipette run's mean volume shows as " + meanShown + ", not 1000.0429 µL");
    const pipetteRun = await page.$eval("a[href^='/runs/']", (e) => e.getAttribute("href"));
    await shot(page, "09-pipette-check-recorded");
    await page.goto(address + "calibrations/new");
    await shot(page, "10-calibration-upload");
    await Promise.all([page.waitForNavigation(), page.click("form.leave button")]);

    // The reviewer voids the pipette run from its page: a reason and her password.
    await logIn(page, address, "rhea", "rhea-password-for-the-test");
    await page.goto(address + pipetteRun.slice(1));
    await shot(page, "11-run-page-reviewer");
    await page.type("#void-reason", "recorded on the wrong pipette");
    await page.type("#void-password", "rhea-password-for-the-test");
    await Promise.all([page.waitForNavigation(), page.click("form[action$='/void'] button")]);
    const standing = await page.$eval("#standing", (e) => e.textContent.trim());
    if (standing !== "void") fail("after the void, run " + pipetteRun + " is \"" + standing + "\", not void");
    const voidReason = await page.$eval("#void-reason-shown", (e) => e.textContent.trim());
    if (voidReason !== "recorded on the wrong pipette") fail("the void's reason shows as \"" + voidReason + "\"");
    await shot(page, "12-run-void");
    await Promise.all([page.waitForNavigation(), page.click("form.leave button")]);

    // The administrator's users page: add a reviewer.
    await logIn(page, address, "ada", "admin-password-for-the-test");
    await page.goto(address + "users");
    await shot(page, "13-users");
    await page.type("#login", "noor");
    await page.type("#name", "Noor Lindqvist");
    await page.click("input[name=role][value=reviewer]");
    await page.type("#password", "noor-first-password-for-the-test");
    await page.type("#password_again", "noor-first-password-for-the-test");
    await Promise.all([page.waitForNavigation(), page.click("#add-user button[type=submit]")]);
    const row = await page.$eval("#user-noor", (e) => e.textContent);
    if (!row.includes("Noor Lindqvist") || !row.includes("reviewer") || !row.includes("must change password"))
      fail("the users page does not list noor as a reviewer who must change the password: " + row);
    await shot(page, "14-user-added");
    await Promise.all([page.waitForNavigation(), page.click("form.leave button")]);

    // With JavaScript off: the weekly check's "Preview" button posts the form and the server's preview comes back;
    // "Record" records.
    const plain = await browser.newPage();
    await plain.setJavaScriptEnabled(false);
    await plain.setViewport({ width: 1280, height: 900 });
    await logIn(plain, address, "tess", "tess-password-for-the-test");
    await plain.goto(address + "checks/new");
    await plain.select("#balance", "BAL-A");
    await plain.select("#weight", "W100");
    await toEndOf(plain, "#readings");
    await plain.keyboard.type(readings.join("\n"));
    await Promise.all([plain.waitForNavigation(), plain.click("#check-form button[value=preview]")]);
    const plainPreview = await plain.$eval("#preview-verdict", (e) => e.textContent.trim());
    if (plainPreview !== "pass") fail("without JavaScript the preview says \"" + plainPreview + "\", not pass");
    const typedBack = await plain.$eval("#readings", (e) => e.value);
    if (!typedBack.includes("100.0004")) fail("without JavaScript the preview lost the readings typed");
    await shot(plain, "15-no-javascript-preview");
    await Promise.all([plain.waitForNavigation(), plain.click("#check-form button[value=record]")]);
    const plainVerdict = await plain.$eval("#verdict", (e) => e.textContent.trim());
    if (plainVerdict !== "BAL-A: pass") fail("without JavaScript the recorded check says \"" + plainVerdict + "\"");
    await shot(plain, "16-no-javascript-recorded");
    await plain.close();  // its session (the browser's cookies) stays: the pages below are tess's
    await page.goto(address + "instruments/BAL-A");
    await shot(page, "17-instrument");
    await page.goto(address + "audit");
    await shot(page, "18-audit");
    await page.setViewport({ width: 768, height: 1024 });
    await page.goto(address);
    await shot(page, "19-overview-tablet");
    if (refusedByPolicy.length) fail("the browser refused something under the CSP: " + refusedByPolicy.join("; "));
    console.log("browser test: passed (screenshots in " + shots + ")");
  } finally {
    if (browser) await browser.close();
    child.kill("SIGTERM");
  }
}

main().catch((e) => fail(e.stack || String(e)));
