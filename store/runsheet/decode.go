package runsheet

import (
	"bytes"
	"strings"
	"unicode/utf16"
	"unicode/utf8"
)

// Encodings a sheet may arrive in.
const (
	encodingUTF8    = "UTF-8"
	encodingUTF8BOM = "UTF-8 with byte-order mark"
	encodingUTF16LE = "UTF-16LE"
	encodingUTF16BE = "UTF-16BE"
	encoding1252    = "Windows-1252 (the text was not UTF-8)"
)

// decode turns the bytes of a saved sheet into text: UTF-8 with or without
// a byte-order mark, UTF-16 with one (spreadsheet "Unicode text"), and
// otherwise Windows-1252, which older spreadsheet programs write.
func decode(b []byte) (text, encoding string, ok bool) {
	switch {
	case bytes.HasPrefix(b, []byte{0xEF, 0xBB, 0xBF}):
		b = b[3:]
		if !utf8.Valid(b) {
			return "", encodingUTF8BOM, false
		}
		return string(b), encodingUTF8BOM, true
	case bytes.HasPrefix(b, []byte{0xFF, 0xFE}), bytes.HasPrefix(b, []byte{0xFE, 0xFF}):
		little := b[0] == 0xFF
		b = b[2:]
		if len(b)%2 != 0 {
			return "", encodingUTF16LE, false
		}
		u := make([]uint16, len(b)/2)
		for i := range u {
			if little {
				u[i] = uint16(b[2*i]) | uint16(b[2*i+1])<<8
			} else {
				u[i] = uint16(b[2*i])<<8 | uint16(b[2*i+1])
			}
		}
		enc := encodingUTF16BE
		if little {
			enc = encodingUTF16LE
		}
		return string(utf16.Decode(u)), enc, true
	case utf8.Valid(b):
		return string(b), encodingUTF8, true
	}
	var sb strings.Builder
	sb.Grow(len(b) + len(b)/8)
	for _, c := range b {
		if c >= 0x80 && c < 0xA0 {
			sb.WriteRune(cp1252[c-0x80])
		} else {
			sb.WriteRune(rune(c))
		}
	}
	return sb.String(), encoding1252, true
}

// cp1252 maps bytes 0x80-0x9F of Windows-1252 to Unicode; the five bytes the
// code page leaves undefined become U+FFFD. Bytes 0xA0-0xFF are Latin-1.
//
// Reference: Unicode Consortium mapping table CP1252.TXT (common practice).
var cp1252 = [32]rune{
	'€', '\uFFFD', '‚', 'ƒ', '„', '…', '†', '‡', 'ˆ', '‰', 'Š', '‹', 'Œ', '\uFFFD', 'Ž', '\uFFFD',
	'\uFFFD', '‘', '’', '“', '”', '•', '–', '—', '˜', '™', 'š', '›', 'œ', '\uFFFD', 'ž', 'Ÿ',
}

// detectDelimiter picks the cell separator among tab, semicolon and comma:
// the one that splits the most of the first lines into the same number of
// cells, counting only outside double quotes. Ties go to tab, then
// semicolon (a semicolon sheet may hold decimal commas), then comma.
func detectDelimiter(text string) rune {
	var lines []string
	for _, l := range strings.Split(text, "\n") {
		if strings.TrimSpace(l) != "" {
			lines = append(lines, l)
		}
		if len(lines) == 20 {
			break
		}
	}
	best, bestScore, bestMode := ',', -1, 0
	for _, d := range []rune{'\t', ';', ','} {
		counts := map[int]int{}
		for _, l := range lines {
			n, quoted := 0, false
			for _, r := range l {
				switch {
				case r == '"':
					quoted = !quoted
				case r == d && !quoted:
					n++
				}
			}
			if n > 0 {
				counts[n]++
			}
		}
		mode, score := 0, 0
		for n, c := range counts {
			if c > score || (c == score && n > mode) {
				mode, score = n, c
			}
		}
		if score > bestScore || (score == bestScore && mode > bestMode) {
			best, bestScore, bestMode = d, score, mode
		}
	}
	return best
}
