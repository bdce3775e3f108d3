// dump.mjs FILE: prints, as JSON, every branch of every tree of the ROOT
// file FILE as read by jsroot (https://root.cern/js/), one array of
// values per branch with one element per entry:
//
//	{"reader": "jsroot 7.11.2", "trees": {"events": {"entries": 6,
//	  "branches": {"hit_time": [[...], ...], ...}}}, "objects": {...}}
//
// 64-bit integers that jsroot returns as BigInt, or as Number beyond
// 2^53, are printed as decimal strings; typed arrays as plain arrays. Used
// by the Go test TestJSROOT in sim/event, which compares every value with
// the Go reader. Install with `npm ci --ignore-scripts` in this directory.
import { openFile, version } from 'jsroot';
import { TSelector, treeProcess } from 'jsroot/tree';
import { readFileSync } from 'node:fs';

function plain(v) {
   if (typeof v === 'bigint')
      return v.toString();
   if (typeof v === 'number' && Number.isInteger(v) && !Number.isSafeInteger(v))
      return BigInt(v).toString();
   if (ArrayBuffer.isView(v) || Array.isArray(v))
      return Array.from(v, plain);
   return v;
}

const path = process.argv[2];
if (!path) {
   console.error('usage: node dump.mjs FILE.root');
   process.exit(2);
}
// openFile takes an ArrayBuffer as well as a name; reading the bytes here
// keeps the test independent of jsroot's node file access.
const bytes = readFileSync(path);
const file = await openFile(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength));
const out = { reader: `jsroot ${version}`, trees: {}, objects: {} };
for (const key of file.fKeys) {
   if (key.fClassName === 'TTree') {
      const tree = await file.readObject(key.fName);
      const sel = new TSelector();
      const names = [];
      for (let i = 0; i < tree.fBranches.arr.length; i++) {
         const b = tree.fBranches.arr[i];
         names.push(b.fName);
         sel.addBranch(b, `b${i}`);
      }
      const branches = {};
      for (const n of names)
         branches[n] = [];
      sel.Process = function () {
         for (let i = 0; i < names.length; i++)
            branches[names[i]].push(plain(this.tgtobj[`b${i}`]));
      };
      await treeProcess(tree, sel);
      out.trees[key.fName] = { entries: Number(tree.fEntries), branches };
   } else if (key.fClassName === 'TObjString') {
      const obj = await file.readObject(key.fName);
      out.objects[key.fName] = obj.fString;
   }
}
process.stdout.write(JSON.stringify(out));
