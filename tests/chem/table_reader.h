#pragma once
// A small JSON reader for the chemistry tests' tables (tests/data/*.json), in plain C++ so that
// the tests need no Qt. It reads RFC 8259 JSON into a tree; a malformed file stops the test run
// with the byte offset. Not for the programs: they read documents through app/core.
#include <cstdlib>
#include <fstream>
#include <map>
#include <memory>
#include <sstream>
#include <stdexcept>
#include <string>
#include <vector>

namespace chem::testing {

struct Json {
    enum class Kind { null, boolean, number, string, array, object } kind = Kind::null;
    bool boolean = false;
    double number = 0;
    std::string string;
    std::vector<Json> array;
    std::map<std::string, Json> object; ///< keys in sorted order (as QJsonObject iterates them)

    bool has(const std::string& key) const { return object.count(key) != 0; }
    /// The member `key`; throws when there is none.
    const Json& operator[](const std::string& key) const {
        const auto it = object.find(key);
        if (it == object.end())
            throw std::runtime_error("table: no member \"" + key + "\"");
        return it->second;
    }
};

namespace detail {

class JsonParser {
  public:
    explicit JsonParser(const std::string& text) : s_(text) {}
    Json document() {
        Json v = value();
        blank();
        if (i_ != s_.size())
            fail("text after the document");
        return v;
    }

  private:
    const std::string& s_;
    size_t i_ = 0;

    [[noreturn]] void fail(const std::string& what) const {
        throw std::runtime_error("table: " + what + " at byte " + std::to_string(i_));
    }
    void blank() {
        while (i_ < s_.size() &&
               (s_[i_] == ' ' || s_[i_] == '\n' || s_[i_] == '\r' || s_[i_] == '\t'))
            ++i_;
    }
    bool take(char c) {
        blank();
        if (i_ < s_.size() && s_[i_] == c) {
            ++i_;
            return true;
        }
        return false;
    }
    void expect(char c) {
        if (!take(c))
            fail(std::string("expected '") + c + "'");
    }
    bool word(const char* w) {
        const std::string k(w);
        if (s_.compare(i_, k.size(), k) != 0)
            return false;
        i_ += k.size();
        return true;
    }
    static void append_utf8(std::string& out, unsigned long cp) {
        if (cp < 0x80) {
            out += char(cp);
        } else if (cp < 0x800) {
            out += char(0xC0 | (cp >> 6));
            out += char(0x80 | (cp & 0x3F));
        } else if (cp < 0x10000) {
            out += char(0xE0 | (cp >> 12));
            out += char(0x80 | ((cp >> 6) & 0x3F));
            out += char(0x80 | (cp & 0x3F));
        } else {
            out += char(0xF0 | (cp >> 18));
            out += char(0x80 | ((cp >> 12) & 0x3F));
            out += char(0x80 | ((cp >> 6) & 0x3F));
            out += char(0x80 | (cp & 0x3F));
        }
    }
    unsigned long hex4() {
        if (i_ + 4 > s_.size())
            fail("short \\u escape");
        const unsigned long v = std::strtoul(s_.substr(i_, 4).c_str(), nullptr, 16);
        i_ += 4;
        return v;
    }
    std::string text() {
        expect('"');
        std::string out;
        while (i_ < s_.size() && s_[i_] != '"') {
            char c = s_[i_++];
            if (c != '\\') {
                out += c;
                continue;
            }
            if (i_ >= s_.size())
                fail("unfinished escape");
            c = s_[i_++];
            switch (c) {
            case 'b':
                out += '\b';
                break;
            case 'f':
                out += '\f';
                break;
            case 'n':
                out += '\n';
                break;
            case 'r':
                out += '\r';
                break;
            case 't':
                out += '\t';
                break;
            case 'u': {
                unsigned long cp = hex4();
                if (cp >= 0xD800 && cp < 0xDC00 && word("\\u"))
                    cp = 0x10000 + ((cp - 0xD800) << 10) + (hex4() - 0xDC00);
                append_utf8(out, cp);
                break;
            }
            default:
                out += c; // \" \\ \/
            }
        }
        if (i_ >= s_.size())
            fail("unfinished string");
        ++i_;
        return out;
    }
    Json value() {
        blank();
        if (i_ >= s_.size())
            fail("missing value");
        Json v;
        const char c = s_[i_];
        if (c == '{') {
            v.kind = Json::Kind::object;
            ++i_;
            if (take('}'))
                return v;
            do {
                blank();
                const std::string key = text();
                expect(':');
                v.object[key] = value();
            } while (take(','));
            expect('}');
        } else if (c == '[') {
            v.kind = Json::Kind::array;
            ++i_;
            if (take(']'))
                return v;
            do
                v.array.push_back(value());
            while (take(','));
            expect(']');
        } else if (c == '"') {
            v.kind = Json::Kind::string;
            v.string = text();
        } else if (word("true")) {
            v.kind = Json::Kind::boolean;
            v.boolean = true;
        } else if (word("false")) {
            v.kind = Json::Kind::boolean;
        } else if (word("null")) {
            v.kind = Json::Kind::null;
        } else {
            char* end = nullptr;
            v.kind = Json::Kind::number;
            v.number = std::strtod(s_.c_str() + i_, &end);
            if (end == s_.c_str() + i_)
                fail("not a value");
            i_ = size_t(end - s_.c_str());
        }
        return v;
    }
};

} // namespace detail

/// Reads the JSON file at `path`; throws std::runtime_error naming the file when it cannot.
inline Json read_table(const std::string& path) {
    std::ifstream f(path, std::ios::binary);
    if (!f)
        throw std::runtime_error("cannot open " + path);
    std::ostringstream ss;
    ss << f.rdbuf();
    try {
        return detail::JsonParser(ss.str()).document();
    } catch (const std::runtime_error& e) {
        throw std::runtime_error(path + ": " + e.what());
    }
}

} // namespace chem::testing
