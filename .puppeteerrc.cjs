// loopsheet never downloads a browser: it uses one that is installed (see src/render/browser.ts).
module.exports = { skipDownload: true };
